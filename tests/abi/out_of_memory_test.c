/* An allocation failure is a status, not a crash (nucleate.h: NUCLEATE_ERROR_OUT_OF_MEMORY).
   A child process lowers its address-space limit (RLIMIT_AS) to 200 MB above what it uses, asks
   for the largest schedule the ceilings allow (10 million steps: about 1 GB of tables and reply),
   and must get NUCLEATE_ERROR_OUT_OF_MEMORY with a message; afterwards the library still answers
   small calls in the same process. The parent checks that the child exited rather than died.
   Skipped (exit 77) under AddressSanitizer, whose shadow memory does not fit an address-space
   limit. POSIX only: fork, setrlimit, /proc/self/statm (Linux). */
#define _POSIX_C_SOURCE 200809L
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/resource.h>
#include <sys/wait.h>
#include <unistd.h>

#include <nucleate/nucleate.h>

#include "check.h"

#if defined(__SANITIZE_ADDRESS__)
#define NUCLEATE_UNDER_ASAN 1
#elif defined(__has_feature)
#if __has_feature(address_sanitizer)
#define NUCLEATE_UNDER_ASAN 1
#endif
#endif

static const char kHuge[] =
    "{\"variance\":{\"kind\":\"VARIANCE_KIND_COSINE\",\"steps\":10000000},"
    "\"limits\":{\"max_steps\":10000000}}";
static const char kSmall[] = "{\"variance\":{\"kind\":\"VARIANCE_KIND_COSINE\",\"steps\":1000}}";

static long mapped_bytes(void) {
  FILE* statm = fopen("/proc/self/statm", "r");
  long pages = -1;
  if (statm == NULL) return -1;
  if (fscanf(statm, "%ld", &pages) != 1) pages = -1;
  fclose(statm);
  return pages < 0 ? -1 : pages * sysconf(_SC_PAGESIZE);
}

static nucleate_status call(const char* method, const char* json, char** message) {
  void* reply = NULL;
  size_t size = 0;
  const nucleate_status status =
      nucleate_call(method, json, strlen(json), NUCLEATE_ENCODING_JSON, &reply, &size, message);
  nucleate_free(reply);
  return status;
}

static int child(void) {
  char* message = NULL;
  struct rlimit limit;
  nucleate_status status;
  /* Load everything the calls need before the limit: the first call initialises the library. */
  CHECK(call("Schedule", kSmall, NULL) == NUCLEATE_OK);
  {
    const long used = mapped_bytes();
    CHECK(used > 0);
    limit.rlim_cur = limit.rlim_max = (rlim_t)used + (rlim_t)200 * 1024 * 1024;
    CHECK(setrlimit(RLIMIT_AS, &limit) == 0);
  }
  status = call("Schedule", kHuge, &message);
  CHECK(status == NUCLEATE_ERROR_OUT_OF_MEMORY);
  CHECK(message != NULL);
  if (message != NULL) {
    printf("refused: %s: %s\n", nucleate_status_name(status), message);
    CHECK(strstr(message, "memory") != NULL);
  }
  nucleate_free(message);
  /* The same process goes on. */
  CHECK(call("Version", "{}", NULL) == NUCLEATE_OK);
  CHECK(call("Schedule", kSmall, NULL) == NUCLEATE_OK);
  return check_report();
}

int main(void) {
#ifdef NUCLEATE_UNDER_ASAN
  printf("skipped: AddressSanitizer reserves terabytes of shadow memory; RLIMIT_AS cannot apply\n");
  return 77;
#else
  int wstatus = 0;
  const pid_t pid = fork();
  if (pid < 0) {
    perror("fork");
    return 1;
  }
  if (pid == 0) {
    const int code = child();
    fflush(stdout);  /* _exit does not flush stdio */
    _exit(code);
  }
  if (waitpid(pid, &wstatus, 0) != pid) {
    perror("waitpid");
    return 1;
  }
  if (WIFSIGNALED(wstatus)) {
    fprintf(stderr, "the child died of signal %d instead of returning a status\n",
            WTERMSIG(wstatus));
    return 1;
  }
  return WIFEXITED(wstatus) ? WEXITSTATUS(wstatus) : 1;
#endif
}
