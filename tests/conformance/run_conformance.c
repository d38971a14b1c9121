/* The conformance suite through the linked C ABI: nucleate_call itself.
   Usage: run_conformance CASES_DIR [EXPECTED_CASE_COUNT] */
#include <stdio.h>
#include <stdlib.h>

#include <nucleate/nucleate.h>

#include "case_files.h"

int main(int argc, char** argv) {
  if (argc < 2 || argc > 3) {
    fprintf(stderr, "usage: %s CASES_DIR [EXPECTED_CASE_COUNT]\n", argv[0]);
    return 2;
  }
  return run_all_cases(argv[1], argc == 3 ? strtol(argv[2], NULL, 10) : -1, nucleate_call,
                       nucleate_free);
}
