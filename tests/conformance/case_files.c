/* POSIX for opendir and stat: the suite runs on Linux and other POSIX HPC systems. */
#define _POSIX_C_SOURCE 200809L

#include "case_files.h"

#include <dirent.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>

static char* join_path(const char* a, const char* b, const char* c) {
  const size_t size = strlen(a) + strlen(b) + (c != NULL ? strlen(c) : 0) + 3;
  char* path = (char*)malloc(size);
  if (path == NULL) return NULL;
  if (c != NULL) {
    snprintf(path, size, "%s/%s/%s", a, b, c);
  } else {
    snprintf(path, size, "%s/%s", a, b);
  }
  return path;
}

static int compare_names(const void* a, const void* b) {
  return strcmp(*(char* const*)a, *(char* const*)b);
}

char** list_case_names(const char* directory, size_t* count) {
  DIR* folder = opendir(directory);
  char** names = NULL;
  size_t capacity = 0;
  struct dirent* entry;
  *count = 0;
  if (folder == NULL) return NULL;
  while ((entry = readdir(folder)) != NULL) {
    struct stat info;
    char* path;
    int is_folder;
    if (entry->d_name[0] == '.') continue;
    path = join_path(directory, entry->d_name, NULL);
    is_folder = path != NULL && stat(path, &info) == 0 && S_ISDIR(info.st_mode);
    free(path);
    if (!is_folder) continue;
    if (*count == capacity) {
      char** grown;
      capacity = capacity == 0 ? 32 : 2 * capacity;
      grown = (char**)realloc(names, capacity * sizeof *names);
      if (grown == NULL) break;
      names = grown;
    }
    names[*count] = (char*)malloc(strlen(entry->d_name) + 1);
    if (names[*count] == NULL) break;
    strcpy(names[*count], entry->d_name);
    ++*count;
  }
  closedir(folder);
  if (names == NULL) names = (char**)malloc(sizeof *names); /* an empty but valid list */
  if (*count > 1) qsort(names, *count, sizeof *names, compare_names);
  return names;
}

void free_case_names(char** names, size_t count) {
  size_t i;
  for (i = 0; i < count; ++i) free(names[i]);
  free(names);
}

char* read_case_file(const char* directory, const char* name, const char* file, size_t* size) {
  char* path = join_path(directory, name, file);
  FILE* stream = path != NULL ? fopen(path, "rb") : NULL;
  char* bytes = NULL;
  size_t capacity = 0;
  *size = 0;
  free(path);
  if (stream == NULL) return NULL;
  for (;;) {
    size_t got;
    if (*size + 4096 + 1 > capacity) {
      char* grown;
      capacity = 2 * capacity + 4096 + 1;
      grown = (char*)realloc(bytes, capacity);
      if (grown == NULL) {
        free(bytes);
        fclose(stream);
        return NULL;
      }
      bytes = grown;
    }
    got = fread(bytes + *size, 1, 4096, stream);
    *size += got;
    if (got < 4096) break;
  }
  if (ferror(stream)) {
    free(bytes);
    bytes = NULL;
  } else {
    bytes[*size] = '\0';
  }
  fclose(stream);
  return bytes;
}

int equal_ignoring_final_newline(const char* a, size_t a_size, const char* b, size_t b_size) {
  if (a_size > 0 && a[a_size - 1] == '\n') --a_size;
  if (b_size > 0 && b[b_size - 1] == '\n') --b_size;
  return a_size == b_size && (a_size == 0 || memcmp(a, b, a_size) == 0);
}

/* Replies are long single lines: show where they part, with some context on both sides. */
static void print_difference(const char* name, const char* got, size_t got_size,
                             const char* expected, size_t expected_size) {
  size_t at = 0, from;
  while (at < got_size && at < expected_size && got[at] == expected[at]) ++at;
  from = at > 40 ? at - 40 : 0;
  printf("FAIL %s: reply differs at byte %lu (of %lu, expected %lu)\n", name, (unsigned long)at,
         (unsigned long)got_size, (unsigned long)expected_size);
  printf("  got:      ...%.80s\n  expected: ...%.80s\n", got + from, expected + from);
}

/* Runs one case; returns 1 if it passed, printing why not otherwise. */
static int run_case(const char* directory, const char* name, case_call_fn call,
                    case_free_fn release) {
  size_t method_size, request_size, status_size, expected_size, reply_size = 0;
  char* method = read_case_file(directory, name, "method", &method_size);
  char* request = read_case_file(directory, name, "request.json", &request_size);
  char* status_text = read_case_file(directory, name, "expected_status", &status_size);
  char* expected = read_case_file(directory, name, "expected_reply.json", &expected_size);
  void* reply = NULL;
  char* message = NULL;
  int passed = 0;
  if (method == NULL || request == NULL || status_text == NULL || expected == NULL) {
    printf("FAIL %s: a case file is missing\n", name);
  } else {
    const long expected_status = strtol(status_text, NULL, 10);
    nucleate_status status;
    method[strcspn(method, "\r\n")] = '\0';
    status = call(method, request, request_size, NUCLEATE_ENCODING_JSON, &reply, &reply_size,
                  &message);
    if (status != expected_status) {
      printf("FAIL %s: status %d, expected %ld (%s)\n", name, (int)status, expected_status,
             message != NULL ? message : "no message");
    } else if (reply == NULL ||
               !equal_ignoring_final_newline((const char*)reply, reply_size, expected,
                                             expected_size)) {
      print_difference(name, reply != NULL ? (const char*)reply : "", reply_size, expected,
                       expected_size);
    } else if (status == NUCLEATE_OK && message != NULL) {
      printf("FAIL %s: a message on success: %s\n", name, message);
    } else if (status != NUCLEATE_OK &&
               (message == NULL || message[0] == '\0' || strchr(message, '\n') != NULL)) {
      printf("FAIL %s: the message is not one non-empty line: %s\n", name,
             message != NULL ? message : "(null)");
    } else {
      passed = 1;
    }
  }
  release(reply);
  release(message);
  free(method);
  free(request);
  free(status_text);
  free(expected);
  return passed;
}

int run_all_cases(const char* directory, long expected_count, case_call_fn call,
                  case_free_fn release) {
  size_t count = 0, i;
  int passed = 0, failed = 0;
  char** names = list_case_names(directory, &count);
  if (names == NULL) {
    printf("cannot list the cases in %s\n", directory);
    return 1;
  }
  for (i = 0; i < count; ++i) {
    if (run_case(directory, names[i], call, release)) {
      ++passed;
    } else {
      ++failed;
    }
  }
  free_case_names(names, count);
  printf("%d passed, %d failed\n", passed, failed);
  if (expected_count >= 0 && (long)count != expected_count) {
    printf("found %lu cases in %s, expected %ld\n", (unsigned long)count, directory,
           expected_count);
    return 1;
  }
  return failed == 0 && passed > 0 ? 0 : 1;
}
