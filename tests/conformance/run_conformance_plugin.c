/* The conformance suite through the plugin table, as a host that dlopens libnucleate sees it.
   Not linked against libnucleate. Usage: run_conformance_plugin LIBRARY CASES_DIR [COUNT] */
#include <dlfcn.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <nucleate/nucleate.h>

#include "case_files.h"

int main(int argc, char** argv) {
  void* library;
  void* symbol;
  nucleate_plugin_entry_fn entry;
  const nucleate_plugin_v1* table;
  int result;
  if (argc < 3 || argc > 4) {
    fprintf(stderr, "usage: %s LIBRARY CASES_DIR [EXPECTED_CASE_COUNT]\n", argv[0]);
    return 2;
  }
  library = dlopen(argv[1], RTLD_NOW | RTLD_LOCAL);
  if (library == NULL) {
    printf("dlopen failed: %s\n", dlerror());
    return 1;
  }
  symbol = dlsym(library, "nucleate_plugin_entry");
  if (symbol == NULL) {
    printf("no nucleate_plugin_entry in %s\n", argv[1]);
    return 1;
  }
  memcpy(&entry, &symbol, sizeof entry); /* object to function pointer, within ISO C */
  table = entry(NUCLEATE_ABI_VERSION);
  if (table == NULL) {
    printf("%s does not serve ABI %d\n", argv[1], NUCLEATE_ABI_VERSION);
    return 1;
  }
  result = run_all_cases(argv[2], argc == 4 ? strtol(argv[3], NULL, 10) : -1, table->call,
                         table->free);
  dlclose(library);
  return result;
}
