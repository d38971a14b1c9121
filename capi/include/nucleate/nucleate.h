/*
 * nucleate: diffusion-model crystal-structure generation and checking, in-process, with no GPU.
 *
 * This header is the whole contract of the shared library. It is C99; every function is
 * callable from C, C++, Fortran (iso_c_binding) and anything that can dlopen a shared object.
 *
 * How it works: every method takes a request message and returns a reply message, both defined
 * in schemas/nucleate/v1/ (protobuf, package nucleate.v1), encoded either as binary protobuf or as
 * protobuf JSON. The method names are the rpc names of the service block in service.proto.
 *
 * Ownership: the library never keeps a pointer the caller passed in. Everything the library
 * returns through an out-parameter is allocated by the library and released with nucleate_free.
 *
 * Threads: every call is stateless and reentrant; any number of threads may call at once. There is
 * no process-wide setting and no error state kept between calls: the message travels with the call.
 *
 * Errors: every call that can fail returns a nucleate_status. Codes are never renumbered; new ones
 * are only appended. No C++ exception crosses this boundary; the library never aborts, exits or
 * writes to stdout or stderr. Every string in a reply is UTF-8: where a message quotes the
 * caller's bytes that are not, each bad byte appears as U+FFFD.
 *
 * Stability: functions are never removed and their signatures never change; new behaviour arrives
 * as new functions. "Since" gives the library version that introduced each.
 */
#ifndef NUCLEATE_NUCLEATE_H
#define NUCLEATE_NUCLEATE_H

#include <stddef.h>
#include <stdint.h>

#include "nucleate/nucleate_version.h"

/* Only the functions marked NUCLEATE_API leave the shared object; everything else is hidden. */
#if defined(NUCLEATE_BUILDING_LIBRARY)
#define NUCLEATE_API __attribute__((visibility("default")))
#else
#define NUCLEATE_API
#endif

#ifdef __cplusplus
extern "C" {
#endif

/* ---- Status codes (since 0.1.0). Never renumbered; only appended. ---------------------------- */

typedef int32_t nucleate_status;

#define NUCLEATE_OK 0
/* The method name is not one the library knows (see the Version method's list). */
#define NUCLEATE_ERROR_UNKNOWN_METHOD 1
/* The encoding argument is neither NUCLEATE_ENCODING_BINARY nor NUCLEATE_ENCODING_JSON. */
#define NUCLEATE_ERROR_BAD_ENCODING 2
/* The request bytes do not parse as the method's request message (wrong bytes, wrong JSON types,
   unknown JSON field, a string field that is not UTF-8). */
#define NUCLEATE_ERROR_MALFORMED_REQUEST 3
/* The request parses, but a field holds a value outside its domain; the message names the field. */
#define NUCLEATE_ERROR_INVALID_ARGUMENT 4
/* A size in the request is above its limit; the message names the field and the limit. */
#define NUCLEATE_ERROR_LIMIT_EXCEEDED 5
/* Memory could not be allocated. */
#define NUCLEATE_ERROR_OUT_OF_MEMORY 6
/* A broken invariant inside nucleate: a bug, please report it with the request. */
#define NUCLEATE_ERROR_INTERNAL 7
/* A required pointer argument was NULL; nothing was done. */
#define NUCLEATE_ERROR_NULL_ARGUMENT 8
/* A file could not be read or written. */
#define NUCLEATE_ERROR_IO 9
/* The caller's progress callback asked to stop; the reply holds what was finished. */
#define NUCLEATE_ERROR_CANCELLED 10
/* A computation lost meaning (overflow, no convergence) for the values given. */
#define NUCLEATE_ERROR_NUMERICAL 11
/* A valid request that this version does not handle. */
#define NUCLEATE_ERROR_UNSUPPORTED 12
/* The caller's sum_doubles of a nucleate_call_collective reported a failure (since 0.1.0). */
#define NUCLEATE_ERROR_COLLECTIVE 13

/* Symbolic name of a status code ("NUCLEATE_ERROR_INVALID_ARGUMENT"), or "NUCLEATE_STATUS_UNKNOWN".
   The string is static; do not free it. Since 0.1.0. */
NUCLEATE_API const char* nucleate_status_name(nucleate_status status);

/* ---- Encodings (since 0.1.0) ----------------------------------------------------------------- */

#define NUCLEATE_ENCODING_BINARY 0 /* binary protobuf */
#define NUCLEATE_ENCODING_JSON 1   /* protobuf JSON; replies use proto field names (snake_case) */

/* ---- Version (since 0.1.0) ------------------------------------------------------------------- */

/* The run-time library version, "major.minor.patch"; static, do not free. Compare with
   NUCLEATE_VERSION_STRING to detect a header/library mismatch. */
NUCLEATE_API const char* nucleate_version(void);

/* The run-time ABI major version (NUCLEATE_ABI_VERSION of the library that was loaded). */
NUCLEATE_API int32_t nucleate_abi_version(void);

/* ---- Calls (since 0.1.0) --------------------------------------------------------------------- */

/* Runs one method.
 *   method        in   NUL-terminated rpc name, e.g. "Schedule".
 *   request       in   request_size bytes of the method's request message; may be NULL when
 *                      request_size is 0 (an empty message). Not kept after the call.
 *   encoding      in   NUCLEATE_ENCODING_BINARY or NUCLEATE_ENCODING_JSON; the reply uses the same.
 *   reply         out  On NUCLEATE_OK, the reply message. On NUCLEATE_ERROR_CANCELLED, the reply
 *                      message with the part finished before the cancel. On any other failure,
 *                      a nucleate.v1.ErrorDetail (binary if the encoding was bad). Free with
 *                      nucleate_free. Required.
 *   reply_size    out  Bytes in *reply (JSON is NUL-terminated beyond reply_size). Required.
 *   message       out  On failure, a one-line NUL-terminated message naming what was wrong and
 *                      where; NULL on success. Free with nucleate_free. May be NULL if unwanted.
 * Returns NUCLEATE_OK or an error code. If reply or reply_size is NULL, returns
 * NUCLEATE_ERROR_NULL_ARGUMENT and touches nothing. */
NUCLEATE_API nucleate_status nucleate_call(const char* method, const void* request,
                                           size_t request_size, int32_t encoding, void** reply,
                                           size_t* reply_size, char** message);

/* Log levels passed to a nucleate_log_fn. */
#define NUCLEATE_LOG_DEBUG 0
#define NUCLEATE_LOG_INFO 1
#define NUCLEATE_LOG_WARNING 2

/* Receives the library's log lines for one call, on the calling thread. `line` is valid only
   during the callback. */
typedef void (*nucleate_log_fn)(int32_t level, const char* line, void* user_data);

/* Receives progress for long work, on the calling thread: fraction in [0, 1] and a short stage
   name. Return 0 to go on, non-zero to cancel; the call then returns NUCLEATE_ERROR_CANCELLED
   and, where the method says so, a reply with what was finished. */
typedef int32_t (*nucleate_progress_fn)(double fraction, const char* stage, void* user_data);

/* As nucleate_call, with per-call callbacks (either may be NULL). user_data is passed back to
   both unchanged. */
NUCLEATE_API nucleate_status nucleate_call_observed(const char* method, const void* request,
                                                    size_t request_size, int32_t encoding,
                                                    nucleate_log_fn log,
                                                    nucleate_progress_fn progress,
                                                    void* user_data, void** reply,
                                                    size_t* reply_size, char** message);

/* ---- Calls that span processes (since 0.1.0) ------------------------------------------------- */

/* The processes of one data-parallel call, described by the caller (an MPI program, typically),
   so that the library itself never links a communication library. */
typedef struct nucleate_collective_v1 {
  uint32_t struct_size; /* sizeof(nucleate_collective_v1) as the caller compiled it */
  int32_t rank;         /* this process, 0 .. size - 1; process 0 alone writes files */
  int32_t size;         /* processes taking part, >= 1 */
  /* Replaces values[0 .. count) by their element-wise sum over all processes, in place. Every
     process calls it with the same count, in the same order; every process must get the same
     bits back (MPI_Reduce to one rank then MPI_Bcast does; MPI_Allreduce may round differently
     on different ranks). Return 0 on success; anything else fails the call on this process
     (the others then fail in their next sum, so the caller should abort the job). */
  int32_t (*sum_doubles)(double* values, int64_t count, void* context);
  void* context; /* passed to sum_doubles unchanged */
} nucleate_collective_v1;

/* As nucleate_call_observed, run by every process of `collective` with the same request: the
   processes share the work and return the same reply. Only Train spreads over processes (each
   process computes its share of every batch's gradient; results equal the single-process run
   within rounding: core/model/DESIGN.md, "Across processes"). Any other method with size > 1
   fails with NUCLEATE_ERROR_INVALID_ARGUMENT naming "collective". collective may be NULL (one
   process). Log and progress callbacks are the caller's to silence on all but one process. */
NUCLEATE_API nucleate_status nucleate_call_collective(
    const char* method, const void* request, size_t request_size, int32_t encoding,
    const nucleate_collective_v1* collective, nucleate_log_fn log, nucleate_progress_fn progress,
    void* user_data, void** reply, size_t* reply_size, char** message);

/* Releases anything the library returned. NULL is allowed and does nothing. */
NUCLEATE_API void nucleate_free(void* pointer);

/* ---- Reading replies without protobuf (since 0.1.0) ------------------------------------------ */

/* Collects every value at `path` in a reply of `method` into a new array of doubles, so callers
 * without a protobuf library (Fortran, plain C) can use replies directly.
 *   path     in   Proto field names joined by dots, e.g. "variance_steps.alpha_bar". Repeated
 *                 fields are walked in order, or one element is picked with a 0-based index,
 *                 e.g. "structures[2].atomic_numbers"; the last field must be numeric
 *                 (any integer, floating-point, bool or enum field; int64 values above 2^53 lose
 *                 precision).
 *   values   out  On NUCLEATE_OK, *count doubles (NULL when *count is 0). Free with nucleate_free.
 *   count    out  Number of values.
 *   message  out  As for nucleate_call.
 * Returns NUCLEATE_ERROR_INVALID_ARGUMENT naming the path part that does not exist, and
 * NUCLEATE_ERROR_MALFORMED_REQUEST if the reply bytes do not parse. */
NUCLEATE_API nucleate_status nucleate_reply_doubles(const char* method, const void* reply,
                                                    size_t reply_size, int32_t encoding,
                                                    const char* path, double** values,
                                                    size_t* count, char** message);

/* ---- Plugin table (since 0.1.0) -------------------------------------------------------------- */

/* For hosts that dlopen the library and look up one symbol. Fields are only ever appended; a host
   reads struct_size before using a field that a later version added. */
typedef struct nucleate_plugin_v1 {
  uint32_t struct_size; /* sizeof the table the library filled */
  uint32_t abi_version; /* NUCLEATE_ABI_VERSION of the library */
  const char* (*version)(void);
  nucleate_status (*call)(const char* method, const void* request, size_t request_size,
                          int32_t encoding, void** reply, size_t* reply_size, char** message);
  nucleate_status (*call_observed)(const char* method, const void* request, size_t request_size,
                                   int32_t encoding, nucleate_log_fn log,
                                   nucleate_progress_fn progress, void* user_data, void** reply,
                                   size_t* reply_size, char** message);
  void (*free)(void* pointer);
  const char* (*status_name)(nucleate_status status);
  nucleate_status (*reply_doubles)(const char* method, const void* reply, size_t reply_size,
                                   int32_t encoding, const char* path, double** values,
                                   size_t* count, char** message);
  /* Appended: present when struct_size > offsetof(nucleate_plugin_v1, call_collective). */
  nucleate_status (*call_collective)(const char* method, const void* request,
                                     size_t request_size, int32_t encoding,
                                     const nucleate_collective_v1* collective,
                                     nucleate_log_fn log, nucleate_progress_fn progress,
                                     void* user_data, void** reply, size_t* reply_size,
                                     char** message);
} nucleate_plugin_v1;

/* Type of nucleate_plugin_entry, for dlsym. */
typedef const nucleate_plugin_v1* (*nucleate_plugin_entry_fn)(uint32_t requested_abi);

/* Returns the static function table if this library serves ABI `requested_abi` (pass
   NUCLEATE_ABI_VERSION from the header you compiled against), else NULL. Never free the table. */
NUCLEATE_API const nucleate_plugin_v1* nucleate_plugin_entry(uint32_t requested_abi);

#ifdef __cplusplus
} /* extern "C" */
#endif

#endif /* NUCLEATE_NUCLEATE_H */
