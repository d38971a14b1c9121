/* The conformance suite's case folders, read with stdio, and the comparison every C runner
   makes. Each case is tests/conformance/cases/<name>/ holding `method` (one line),
   `request.json`, `expected_status` (an integer) and `expected_reply.json` (the reply's exact
   bytes; one trailing newline on either side is ignored). */
#ifndef NUCLEATE_TESTS_CONFORMANCE_CASE_FILES_H
#define NUCLEATE_TESTS_CONFORMANCE_CASE_FILES_H

#include <stddef.h>

#include <nucleate/nucleate.h>

/* The shape of nucleate_call and nucleate_free, so a runner can pass the linked functions or the
   ones from the dlopen plugin table. */
typedef nucleate_status (*case_call_fn)(const char* method, const void* request,
                                        size_t request_size, int32_t encoding, void** reply,
                                        size_t* reply_size, char** message);
typedef void (*case_free_fn)(void* pointer);

/* The sorted names of the sub-folders of `directory`; NULL on failure. Free with
   free_case_names. */
char** list_case_names(const char* directory, size_t* count);
void free_case_names(char** names, size_t count);

/* The whole file at directory/name/file (malloc'd, NUL-terminated beyond *size), or NULL. */
char* read_case_file(const char* directory, const char* name, const char* file, size_t* size);

/* Equal after removing at most one trailing newline from each. */
int equal_ignoring_final_newline(const char* a, size_t a_size, const char* b, size_t b_size);

/* Runs every case through `call` in JSON and compares status and reply bytes; on failure also
   requires a one-line message. Prints one line per failed case and "N passed, M failed".
   Returns the process exit code: 0 only if every case passed and, when expected_count >= 0,
   exactly that many cases were found. */
int run_all_cases(const char* directory, long expected_count, case_call_fn call,
                  case_free_fn release);

#endif /* NUCLEATE_TESTS_CONFORMANCE_CASE_FILES_H */
