/* sample_candidates: candidate crystal structures of one formula from a nucleate model, one CIF
 * file per candidate, as a workflow engine's sampling step would make them.
 *
 *   sample_candidates MODEL FORMULA SEED FIRST_INDEX COUNT OUT_DIR [THREADS]
 *
 * Candidate i of the run is sample FIRST_INDEX + i of the random stream keyed by SEED (one
 * formula unit per cell): the same bytes whatever COUNT, THREADS or the split across jobs, so
 * jobs that take consecutive slices of indices together make exactly the files of one big run.
 *
 * Writes into OUT_DIR (created if missing; files already there are overwritten):
 *   sample-<index>.cif     a finished candidate, the reply's caution as its first comment line;
 *   sample-<index>.failed  the message of a candidate whose chain failed (e.g. its cell blew up).
 * Prints on stdout the caution as a "#" line, then one tab-separated line per candidate:
 *   index, file, formula, "valid" or "invalid", flags (toxic and radioactive elements, or "-").
 * Progress and the library's log lines go to stderr. SIGINT or SIGTERM (Ctrl-C, or a batch
 * scheduler's warning before the time limit) cancels at the next progress report; the candidates
 * finished by then are still written.
 * Exit status: 0 done, 1 failed (nucleate's message on stderr), 2 bad command line, 3 cancelled.
 *
 * Plain C99 and POSIX, and nothing but nucleate.h: requests and replies travel as binary
 * protobuf (the field numbers are those of the .proto files in schemas/nucleate/v1/, which never
 * change), read and written by the few lines of wire format below, and numbers come out of
 * replies through nucleate_reply_doubles. A host with a protobuf library would use its generated
 * classes instead.
 */
#define _POSIX_C_SOURCE 200809L

#include <errno.h>
#include <signal.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>

#include <nucleate/nucleate.h>

enum { EXIT_DONE = 0, EXIT_FAILED = 1, EXIT_USAGE = 2, EXIT_CANCELLED = 3 };

/* ---- Protocol Buffers wire format: only what this program needs ------------------------------
 * A message is a sequence of fields, each a key varint (field number << 3 | wire type) and a
 * value: wire type 0 a varint, 1 eight bytes, 2 a varint length and that many bytes (strings,
 * bytes and embedded messages), 5 four bytes. */

typedef struct {
  unsigned char* data;
  size_t size;
  size_t capacity;
  int out_of_memory;
} buffer;

static void put_raw(buffer* b, const void* bytes, size_t size) {
  if (b->out_of_memory || size == 0) return;
  if (b->size + size > b->capacity) {
    size_t capacity = b->capacity ? b->capacity : 256;
    unsigned char* grown;
    while (capacity < b->size + size) capacity *= 2;
    grown = realloc(b->data, capacity);
    if (grown == NULL) {
      b->out_of_memory = 1;
      return;
    }
    b->data = grown;
    b->capacity = capacity;
  }
  memcpy(b->data + b->size, bytes, size);
  b->size += size;
}

static void put_varint(buffer* b, uint64_t value) {
  unsigned char bytes[10];
  size_t n = 0;
  do {
    bytes[n] = (unsigned char)(value & 0x7f);
    value >>= 7;
    if (value != 0) bytes[n] |= 0x80;
    ++n;
  } while (value != 0);
  put_raw(b, bytes, n);
}

static void put_varint_field(buffer* b, uint32_t field, uint64_t value) {
  put_varint(b, ((uint64_t)field << 3) | 0);
  put_varint(b, value);
}

static void put_bytes_field(buffer* b, uint32_t field, const void* bytes, size_t size) {
  put_varint(b, ((uint64_t)field << 3) | 2);
  put_varint(b, size);
  put_raw(b, bytes, size);
}

/* A read-only view of bytes: a whole reply, or one field's value inside it. */
typedef struct {
  const unsigned char* data;
  size_t size;
} span;

static int read_varint(const unsigned char** at, const unsigned char* end, uint64_t* value) {
  int shift;
  *value = 0;
  for (shift = 0; shift < 64 && *at < end; shift += 7) {
    const unsigned char byte = *(*at)++;
    *value |= (uint64_t)(byte & 0x7f) << shift;
    if ((byte & 0x80) == 0) return 1;
  }
  return 0;
}

/* The value of the occurrence-th (from 0) length-delimited field `field` of `message`. Returns 1
 * when found, 0 when absent or when the bytes are not a well-formed message. */
static int find_field(span message, uint32_t field, size_t occurrence, span* value) {
  const unsigned char* at = message.data;
  const unsigned char* end = message.data + message.size;
  while (at < end) {
    uint64_t key, length = 0;
    if (!read_varint(&at, end, &key)) return 0;
    switch (key & 7) {
      case 0:
        if (!read_varint(&at, end, &length)) return 0;
        length = 0;
        break;
      case 1:
        length = 8;
        break;
      case 2:
        if (!read_varint(&at, end, &length)) return 0;
        break;
      case 5:
        length = 4;
        break;
      default:
        return 0; /* groups: not used by nucleate's messages */
    }
    if (length > (uint64_t)(end - at)) return 0;
    if ((key & 7) == 2 && key >> 3 == field && occurrence-- == 0) {
      value->data = at;
      value->size = (size_t)length;
      return 1;
    }
    at += length;
  }
  return 0;
}

/* A string field at a path of field numbers (each but the last an embedded message), copied into
 * `text` as a NUL-terminated string and cut to fit; "" when absent. */
static const char* string_at(span message, const uint32_t* path, size_t depth, char* text,
                             size_t capacity) {
  span value = message;
  size_t i, n;
  text[0] = '\0';
  for (i = 0; i < depth; ++i) {
    if (!find_field(value, path[i], 0, &value)) return text;
  }
  n = value.size < capacity - 1 ? value.size : capacity - 1;
  memcpy(text, value.data, n);
  text[n] = '\0';
  return text;
}

/* ---- Field numbers, from schemas/nucleate/v1/ ------------------------------------------------ */

/* sample.proto */
enum {
  SAMPLE_REQUEST_MODEL_PATH = 1,
  SAMPLE_REQUEST_COMPOSITION = 2,
  SAMPLE_REQUEST_SEED = 8,
  SAMPLE_REQUEST_FIRST_INDEX = 9,
  SAMPLE_REQUEST_COUNT = 10,
  SAMPLE_REQUEST_THREADS = 11,
  COMPOSITION_TASK_FORMULA = 1,
  SAMPLE_REPLY_CANDIDATES = 1,
  SAMPLE_REPLY_CAUTION = 4,
  CANDIDATE_STRUCTURE = 2,
  CANDIDATE_REPORT = 3
};
/* checks.proto, error.proto */
enum {
  REPORT_ERROR = 3,
  REPORT_FORMULA = 4,
  REPORT_TOXIC_ELEMENTS = 16,
  REPORT_RADIOACTIVE_ELEMENTS = 17,
  ERROR_DETAIL_MESSAGE = 3,
  ERROR_DETAIL_FIELD = 4
};
/* convert.proto, structure.proto */
enum {
  CONVERT_REQUEST_INPUTS = 1,
  CONVERT_REQUEST_FORMAT = 2,
  STRUCTURE_INPUT_STRUCTURE = 1,
  STRUCTURE_FORMAT_CIF = 1,
  CONVERT_REPLY_TEXT = 1,
  CONVERT_REPLY_UNREADABLE = 3,
  CONVERT_ISSUE_ERROR = 2
};

/* ---- Calls ----------------------------------------------------------------------------------- */

/* What one call returned; release with release_call. */
typedef struct {
  nucleate_status status;
  void* reply;
  size_t reply_size;
  char* message;
} call_result;

static void release_call(call_result* call) {
  nucleate_free(call->reply);
  nucleate_free(call->message);
  call->reply = NULL;
  call->message = NULL;
}

static span reply_of(const call_result* call) {
  span s;
  s.data = (const unsigned char*)call->reply;
  s.size = call->reply_size;
  return s;
}

/* Prints a failed call's status and message and, from the ErrorDetail reply, the field at fault
 * (a host would point its user at that input). */
static void print_failure(const char* what, const call_result* call) {
  static const uint32_t field_path[] = {ERROR_DETAIL_FIELD};
  char field[256];
  fprintf(stderr, "sample_candidates: %s failed: %s: %s\n", what,
          nucleate_status_name(call->status), call->message ? call->message : "(no message)");
  string_at(reply_of(call), field_path, 1, field, sizeof field);
  if (field[0] != '\0') fprintf(stderr, "sample_candidates: ErrorDetail.field: %s\n", field);
}

/* Ctrl-C or the scheduler's SIGTERM: the next progress report asks the library to stop. */
static volatile sig_atomic_t stop_requested = 0;

static void request_stop(int signal_number) {
  (void)signal_number;
  stop_requested = 1;
}

typedef struct {
  int next_percent; /* the next multiple of 10 % to print */
} progress_state;

/* Called on the thread that made the call, so it needs no lock. Returns non-zero to cancel. */
static int32_t on_progress(double fraction, const char* stage, void* user_data) {
  progress_state* state = (progress_state*)user_data;
  const int percent = (int)(fraction * 100.0);
  if (percent >= state->next_percent) {
    fprintf(stderr, "progress: %s %d%%\n", stage, percent);
    state->next_percent = percent / 10 * 10 + 10;
  }
  return stop_requested ? 1 : 0;
}

static void on_log(int32_t level, const char* line, void* user_data) {
  (void)user_data;
  fprintf(stderr, "nucleate %s: %s\n",
          level == NUCLEATE_LOG_WARNING ? "warning" : level == NUCLEATE_LOG_INFO ? "info" : "debug",
          line);
}

/* ---- Command line ---------------------------------------------------------------------------- */

typedef struct {
  const char* model;
  const char* formula;
  uint32_t seed;
  uint32_t first_index;
  uint32_t count;
  const char* out_dir;
  int threads_given;
  uint32_t threads;
} arguments;

/* A decimal number in [minimum, maximum], or a message naming the argument. */
static int parse_number(const char* name, const char* text, unsigned long long minimum,
                        unsigned long long maximum, uint32_t* value) {
  char* end = NULL;
  unsigned long long parsed;
  errno = 0;
  parsed = strtoull(text, &end, 10);
  if (text[0] == '\0' || text[0] == '-' || *end != '\0' || errno != 0 || parsed < minimum ||
      parsed > maximum) {
    fprintf(stderr, "sample_candidates: %s must be a whole number from %llu to %llu, got '%s'\n",
            name, minimum, maximum, text);
    return 0;
  }
  *value = (uint32_t)parsed;
  return 1;
}

static int parse_arguments(int argc, char** argv, arguments* args) {
  if (argc != 7 && argc != 8) {
    fprintf(stderr,
            "usage: %s MODEL FORMULA SEED FIRST_INDEX COUNT OUT_DIR [THREADS]\n"
            "  candidates FIRST_INDEX .. FIRST_INDEX+COUNT-1 of the stream keyed by SEED, one\n"
            "  formula unit of FORMULA per cell, each written to OUT_DIR/sample-<index>.cif;\n"
            "  THREADS 0 (the default) uses every core\n",
            argv[0]);
    return 0;
  }
  args->model = argv[1];
  args->formula = argv[2];
  args->out_dir = argv[6];
  args->threads_given = argc == 8;
  args->threads = 0;
  return parse_number("SEED", argv[3], 0, UINT32_MAX, &args->seed) &&
         parse_number("FIRST_INDEX", argv[4], 0, UINT32_MAX, &args->first_index) &&
         parse_number("COUNT", argv[5], 1, UINT32_MAX, &args->count) &&
         (!args->threads_given || parse_number("THREADS", argv[7], 0, INT32_MAX, &args->threads));
}

/* ---- Files ----------------------------------------------------------------------------------- */

/* Writes `head` then `body` to `path` through a temporary file renamed into place, so a job
 * killed mid-write leaves no half file behind. */
static int write_file(const char* path, const char* head, const void* body, size_t body_size) {
  char partial[4096];
  FILE* file;
  int ok;
  if (snprintf(partial, sizeof partial, "%s.partial", path) >= (int)sizeof partial) {
    fprintf(stderr, "sample_candidates: path too long: %s\n", path);
    return 0;
  }
  file = fopen(partial, "wb");
  if (file == NULL) {
    fprintf(stderr, "sample_candidates: cannot write %s: %s\n", partial, strerror(errno));
    return 0;
  }
  ok = fputs(head, file) >= 0 && fwrite(body, 1, body_size, file) == body_size;
  ok = (fclose(file) == 0) && ok;
  if (ok && rename(partial, path) != 0) ok = 0;
  if (!ok) {
    fprintf(stderr, "sample_candidates: cannot write %s: %s\n", path, strerror(errno));
    remove(partial);
  }
  return ok;
}

/* The element symbols of a repeated string field, joined by commas; "" when none. */
static void join_strings(span report, uint32_t field, char* text, size_t capacity) {
  span value;
  size_t used = 0, k;
  text[0] = '\0';
  for (k = 0; find_field(report, field, k, &value); ++k) {
    if (used + value.size + 2 > capacity) break;
    if (used > 0) text[used++] = ',';
    memcpy(text + used, value.data, value.size);
    used += value.size;
    text[used] = '\0';
  }
}

/* ---- The candidates -------------------------------------------------------------------------- */

/* One candidate's Structure message (bytes as the Sample reply holds them) written as CIF by the
 * library's Convert method, into OUT_DIR/sample-<index>.cif. */
static int write_cif(span structure, const char* caution_line, const char* path) {
  buffer input = {NULL, 0, 0, 0}, request = {NULL, 0, 0, 0};
  call_result call = {0, NULL, 0, NULL};
  span issue, text;
  int ok = 0;
  put_bytes_field(&input, STRUCTURE_INPUT_STRUCTURE, structure.data, structure.size);
  put_bytes_field(&request, CONVERT_REQUEST_INPUTS, input.data, input.size);
  put_varint_field(&request, CONVERT_REQUEST_FORMAT, STRUCTURE_FORMAT_CIF);
  if (input.out_of_memory || request.out_of_memory) {
    fprintf(stderr, "sample_candidates: out of memory\n");
  } else {
    call.status = nucleate_call("Convert", request.data, request.size, NUCLEATE_ENCODING_BINARY,
                                &call.reply, &call.reply_size, &call.message);
    if (call.status != NUCLEATE_OK) {
      print_failure("Convert", &call);
    } else if (find_field(reply_of(&call), CONVERT_REPLY_UNREADABLE, 0, &issue)) {
      static const uint32_t path_of_message[] = {CONVERT_ISSUE_ERROR, ERROR_DETAIL_MESSAGE};
      char message[1024];
      fprintf(stderr, "sample_candidates: cannot write %s: %s\n", path,
              string_at(issue, path_of_message, 2, message, sizeof message));
    } else if (find_field(reply_of(&call), CONVERT_REPLY_TEXT, 0, &text)) {
      ok = write_file(path, caution_line, text.data, text.size);
    } else {
      fprintf(stderr, "sample_candidates: Convert returned no text for %s\n", path);
    }
  }
  release_call(&call);
  free(input.data);
  free(request.data);
  return ok;
}

/* Writes every candidate of a Sample reply and prints its line. Returns 1 when all were written. */
static int write_candidates(const call_result* sample, const char* out_dir) {
  static const uint32_t caution_path[] = {SAMPLE_REPLY_CAUTION};
  static const uint32_t formula_path[] = {CANDIDATE_REPORT, REPORT_FORMULA};
  static const uint32_t error_path[] = {CANDIDATE_REPORT, REPORT_ERROR, ERROR_DETAIL_MESSAGE};
  const span reply = reply_of(sample);
  double *indices = NULL, *valid = NULL;
  size_t count = 0, valid_count = 0, k;
  char* message = NULL;
  char caution[1024], caution_line[1100], path[4096], text[1024], toxic[256], radioactive[256];
  int ok = 1;

  /* One number per candidate: the sample index and whether it passed every validity rule. */
  if (nucleate_reply_doubles("Sample", sample->reply, sample->reply_size,
                             NUCLEATE_ENCODING_BINARY, "candidates.index", &indices, &count,
                             &message) != NUCLEATE_OK ||
      nucleate_reply_doubles("Sample", sample->reply, sample->reply_size,
                             NUCLEATE_ENCODING_BINARY, "candidates.report.valid", &valid,
                             &valid_count, &message) != NUCLEATE_OK ||
      valid_count != count) {
    fprintf(stderr, "sample_candidates: cannot read the Sample reply: %s\n",
            message ? message : "candidates and reports disagree in number");
    nucleate_free(message);
    nucleate_free(indices);
    nucleate_free(valid);
    return 0;
  }

  /* Candidates are hypotheses: the reply says so, and so does every file and listing made here. */
  string_at(reply, caution_path, 1, caution, sizeof caution);
  snprintf(caution_line, sizeof caution_line, "# %s\n", caution);
  fputs(caution_line, stdout);

  for (k = 0; k < count && ok; ++k) {
    const unsigned long index = (unsigned long)indices[k];
    span candidate, structure, report;
    if (!find_field(reply, SAMPLE_REPLY_CANDIDATES, k, &candidate)) {
      fprintf(stderr, "sample_candidates: the Sample reply has no candidate %lu\n", index);
      ok = 0;
      break;
    }
    if (!find_field(candidate, CANDIDATE_REPORT, 0, &report)) {
      report.data = candidate.data; /* no report: an empty message */
      report.size = 0;
    }
    if (!find_field(candidate, CANDIDATE_STRUCTURE, 0, &structure)) {
      /* A failed chain has no structure; its report says why. */
      string_at(candidate, error_path, 3, text, sizeof text);
      snprintf(path, sizeof path, "%s/sample-%lu.failed", out_dir, index);
      ok = write_file(path, text, "\n", 1);
      printf("%lu\tsample-%lu.failed\t-\tfailed\t-\n", index, index);
      continue;
    }
    snprintf(path, sizeof path, "%s/sample-%lu.cif", out_dir, index);
    ok = write_cif(structure, caution_line, path);
    if (!ok) break;
    join_strings(report, REPORT_TOXIC_ELEMENTS, toxic, sizeof toxic);
    join_strings(report, REPORT_RADIOACTIVE_ELEMENTS, radioactive, sizeof radioactive);
    printf("%lu\tsample-%lu.cif\t%s\t%s\t", index, index,
           string_at(candidate, formula_path, 2, text, sizeof text),
           valid[k] != 0 ? "valid" : "invalid");
    if (toxic[0] == '\0' && radioactive[0] == '\0') printf("-");
    if (toxic[0] != '\0') printf("toxic:%s%s", toxic, radioactive[0] != '\0' ? " " : "");
    if (radioactive[0] != '\0') printf("radioactive:%s", radioactive);
    printf("\n");
  }
  nucleate_free(indices);
  nucleate_free(valid);
  return ok;
}

int main(int argc, char** argv) {
  arguments args;
  buffer task = {NULL, 0, 0, 0}, request = {NULL, 0, 0, 0};
  call_result sample = {0, NULL, 0, NULL};
  progress_state progress = {0};
  int exit_status = EXIT_FAILED;

  if (!parse_arguments(argc, argv, &args)) return EXIT_USAGE;
  if (mkdir(args.out_dir, 0777) != 0 && errno != EEXIST) {
    fprintf(stderr, "sample_candidates: cannot create %s: %s\n", args.out_dir, strerror(errno));
    return EXIT_FAILED;
  }

  /* The SampleRequest: a composition task, the slice of the stream, the threads. */
  put_bytes_field(&task, COMPOSITION_TASK_FORMULA, args.formula, strlen(args.formula));
  put_bytes_field(&request, SAMPLE_REQUEST_MODEL_PATH, args.model, strlen(args.model));
  put_bytes_field(&request, SAMPLE_REQUEST_COMPOSITION, task.data, task.size);
  put_varint_field(&request, SAMPLE_REQUEST_SEED, args.seed);
  put_varint_field(&request, SAMPLE_REQUEST_FIRST_INDEX, args.first_index);
  put_varint_field(&request, SAMPLE_REQUEST_COUNT, args.count);
  if (args.threads_given) put_varint_field(&request, SAMPLE_REQUEST_THREADS, args.threads);
  if (task.out_of_memory || request.out_of_memory) {
    fprintf(stderr, "sample_candidates: out of memory\n");
    free(task.data);
    free(request.data);
    return EXIT_FAILED;
  }

  signal(SIGINT, request_stop);
  signal(SIGTERM, request_stop);
  sample.status = nucleate_call_observed("Sample", request.data, request.size,
                                         NUCLEATE_ENCODING_BINARY, on_log, on_progress, &progress,
                                         &sample.reply, &sample.reply_size, &sample.message);
  signal(SIGINT, SIG_DFL);
  signal(SIGTERM, SIG_DFL);

  if (sample.status == NUCLEATE_OK || sample.status == NUCLEATE_ERROR_CANCELLED) {
    /* A cancelled call still replies with the candidates that finished. */
    const int written = write_candidates(&sample, args.out_dir);
    if (sample.status == NUCLEATE_ERROR_CANCELLED) {
      fprintf(stderr, "sample_candidates: cancelled; the finished candidates were written\n");
      exit_status = EXIT_CANCELLED;
    } else {
      exit_status = written ? EXIT_DONE : EXIT_FAILED;
    }
  } else {
    print_failure("Sample", &sample);
  }
  release_call(&sample);
  free(task.data);
  free(request.data);
  return exit_status;
}
