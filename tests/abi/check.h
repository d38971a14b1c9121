/* A minimal check counter for the plain-C ABI tests: no test framework, so the programs build
   against nothing but the installed header (and libc). */
#ifndef NUCLEATE_TESTS_ABI_CHECK_H
#define NUCLEATE_TESTS_ABI_CHECK_H

#include <stdio.h>

static int check_passed = 0;
static int check_failed = 0;

/* Records one assertion; on failure prints where and what, then goes on so one run shows all. */
#define CHECK(condition)                                                       \
  do {                                                                         \
    if (condition) {                                                           \
      ++check_passed;                                                          \
    } else {                                                                   \
      ++check_failed;                                                          \
      fprintf(stderr, "%s:%d: check failed: %s\n", __FILE__, __LINE__, #condition); \
    }                                                                          \
  } while (0)

/* Prints the summary line every runner prints and gives the process exit code. */
static int check_report(void) {
  printf("%d passed, %d failed\n", check_passed, check_failed);
  return check_failed == 0 && check_passed > 0 ? 0 : 1;
}

#endif /* NUCLEATE_TESTS_ABI_CHECK_H */
