/* A workflow engine's view of libnucleate: dlopen the file given on the command line, look up
   the single symbol nucleate_plugin_entry, and do everything else through the table. The program
   is not linked against libnucleate, so a missing or renamed entry point fails here. */
#include <dlfcn.h>
#include <math.h>
#include <stddef.h>
#include <string.h>

#include <nucleate/nucleate.h>

#include "check.h"

int main(int argc, char** argv) {
  void* library;
  nucleate_plugin_entry_fn entry;
  const nucleate_plugin_v1* table;
  static const char request[] = "{\"variance\":{\"kind\":\"VARIANCE_KIND_LINEAR\",\"steps\":10}}";
  void* reply = NULL;
  size_t reply_size = 0;
  char* message = NULL;
  double* beta = NULL;
  size_t count = 0;

  if (argc != 2) {
    fprintf(stderr, "usage: %s PATH/TO/libnucleate.so\n", argv[0]);
    return 2;
  }
  library = dlopen(argv[1], RTLD_NOW | RTLD_LOCAL);
  if (library == NULL) {
    fprintf(stderr, "dlopen failed: %s\n", dlerror());
    return 1;
  }
  /* POSIX: converting the object pointer from dlsym to a function pointer goes through memcpy
     to stay within ISO C. */
  {
    void* symbol = dlsym(library, "nucleate_plugin_entry");
    CHECK(symbol != NULL);
    if (symbol == NULL) return check_report();
    memcpy(&entry, &symbol, sizeof entry);
  }

  /* A host built for another ABI major must get no table rather than a wrong one. */
  CHECK(entry(NUCLEATE_ABI_VERSION + 1) == NULL);

  table = entry(NUCLEATE_ABI_VERSION);
  CHECK(table != NULL);
  if (table == NULL) return check_report();
  /* Every field this header knows must be inside what the library filled. */
  CHECK(table->struct_size >= offsetof(nucleate_plugin_v1, reply_doubles) + sizeof(void*));
  CHECK(table->abi_version == NUCLEATE_ABI_VERSION);
  CHECK(table->version != NULL && strcmp(table->version(), NUCLEATE_VERSION_STRING) == 0);
  CHECK(table->call != NULL && table->free != NULL && table->status_name != NULL &&
        table->reply_doubles != NULL && table->call_observed != NULL);
  /* Appended after reply_doubles: a host checks struct_size before using it. */
  CHECK(table->struct_size >= offsetof(nucleate_plugin_v1, call_collective) + sizeof(void*));
  CHECK(table->call_collective != NULL);

  CHECK(table->call("Schedule", request, strlen(request), NUCLEATE_ENCODING_JSON, &reply,
                    &reply_size, &message) == NUCLEATE_OK);
  CHECK(message == NULL);
  CHECK(table->reply_doubles("Schedule", reply, reply_size, NUCLEATE_ENCODING_JSON,
                             "variance_steps.beta", &beta, &count, &message) == NUCLEATE_OK);
  /* Ho et al. 2020, section 4: linear betas from 1e-4 to 0.02. */
  CHECK(count == 10 && beta != NULL);
  if (count == 10 && beta != NULL) {
    CHECK(fabs(beta[0] - 1e-4) <= 1e-15);
    CHECK(fabs(beta[9] - 0.02) <= 1e-15);
  }
  table->free(beta);
  table->free(reply);
  table->free(message);

  reply = NULL;
  message = NULL;
  CHECK(table->call("NoSuchMethod", "{}", 2, NUCLEATE_ENCODING_JSON, &reply, &reply_size,
                    &message) == NUCLEATE_ERROR_UNKNOWN_METHOD);
  CHECK(message != NULL);
  CHECK(strcmp(table->status_name(NUCLEATE_ERROR_UNKNOWN_METHOD),
               "NUCLEATE_ERROR_UNKNOWN_METHOD") == 0);
  table->free(reply);
  table->free(message);

  CHECK(dlclose(library) == 0);
  return check_report();
}
