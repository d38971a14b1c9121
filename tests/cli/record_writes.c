/* LD_PRELOAD shim for file_writes_test.sh: records every call of the process that creates,
   writes, renames, links or removes a file, one line each, into the file named by
   NUCLEATE_TEST_WRITE_LOG (the shim reads the environment; the library under test does not).
   Calls pass through to libc unchanged. Linux and glibc only. */
#define _GNU_SOURCE
#include <dlfcn.h>
#include <fcntl.h>
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <sys/syscall.h>
#include <unistd.h>

static void record(const char* what, const char* path, const char* second) {
  const char* log = getenv("NUCLEATE_TEST_WRITE_LOG");
  char line[8192];
  int n;
  int fd;
  if (log == NULL || path == NULL) return;
  n = snprintf(line, sizeof line, "%s\t%s%s%s\n", what, path, second ? "\t" : "",
               second ? second : "");
  if (n <= 0) return;
  if (n > (int)sizeof line) n = (int)sizeof line;
  /* The raw system call: the log's own open must not be recorded (or recurse). */
  fd = (int)syscall(SYS_openat, AT_FDCWD, log, O_WRONLY | O_CREAT | O_APPEND | O_CLOEXEC, 0644);
  if (fd < 0) return;
  if (write(fd, line, (size_t)n) < 0) { /* nothing to do: the test sees a missing line */ }
  close(fd);
}

static int writes(int flags) { return (flags & (O_WRONLY | O_RDWR | O_CREAT | O_TRUNC)) != 0; }

/* The mode open and openat take only when they may create a file; `flags` is the last named
   argument of all three. */
#define CREATION_MODE(flags, mode)              \
  do {                                          \
    if ((flags) & (O_CREAT | O_TMPFILE)) {      \
      va_list args;                             \
      va_start(args, flags);                    \
      (mode) = va_arg(args, mode_t);            \
      va_end(args);                             \
    }                                           \
  } while (0)

#define NEXT(name) ((__typeof__(&name))dlsym(RTLD_NEXT, #name))

int open(const char* path, int flags, ...) {
  mode_t mode = 0;
  CREATION_MODE(flags, mode);
  if (writes(flags)) record("open", path, NULL);
  return NEXT(open)(path, flags, mode);
}

int open64(const char* path, int flags, ...) {
  mode_t mode = 0;
  CREATION_MODE(flags, mode);
  if (writes(flags)) record("open", path, NULL);
  return NEXT(open64)(path, flags, mode);
}

int openat(int dir, const char* path, int flags, ...) {
  mode_t mode = 0;
  CREATION_MODE(flags, mode);
  if (writes(flags)) record("openat", path, NULL);
  return NEXT(openat)(dir, path, flags, mode);
}

int creat(const char* path, mode_t mode) {
  record("creat", path, NULL);
  return NEXT(creat)(path, mode);
}

FILE* fopen(const char* path, const char* mode) {
  if (strpbrk(mode, "wa+") != NULL) record("fopen", path, NULL);
  return NEXT(fopen)(path, mode);
}

FILE* fopen64(const char* path, const char* mode) {
  if (strpbrk(mode, "wa+") != NULL) record("fopen", path, NULL);
  return NEXT(fopen64)(path, mode);
}

int rename(const char* from, const char* to) {
  record("rename", from, to);
  return NEXT(rename)(from, to);
}

int renameat(int from_dir, const char* from, int to_dir, const char* to) {
  record("renameat", from, to);
  return NEXT(renameat)(from_dir, from, to_dir, to);
}

int link(const char* from, const char* to) {
  record("link", from, to);
  return NEXT(link)(from, to);
}

int symlink(const char* from, const char* to) {
  record("symlink", from, to);
  return NEXT(symlink)(from, to);
}

int unlink(const char* path) {
  record("unlink", path, NULL);
  return NEXT(unlink)(path);
}

int mkdir(const char* path, mode_t mode) {
  record("mkdir", path, NULL);
  return NEXT(mkdir)(path, mode);
}

int truncate(const char* path, off_t length) {
  record("truncate", path, NULL);
  return NEXT(truncate)(path, length);
}
