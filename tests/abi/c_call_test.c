/* A plain C99 client of libnucleate that uses nothing but the installed header: what a C
   framework on a compute node would write. Built against the build tree and again against the
   installed package (tests/consumers). */
#include <math.h>
#include <stdint.h>
#include <stdlib.h>
#include <string.h>

#include <nucleate/nucleate.h>

#include "check.h"

/* Ho et al. 2020, "Denoising Diffusion Probabilistic Models", section 4: betas rise linearly
   from 1e-4 to 0.02. */
#define HO_BETA_START 1e-4
#define HO_BETA_END 0.02
/* A few ulps of 0.02: the endpoints are computed, not copied. */
#define ENDPOINT_TOLERANCE 1e-15

typedef struct {
  nucleate_status status;
  void* reply;
  size_t reply_size;
  char* message;
} call_result;

static call_result call_json(const char* method, const char* request) {
  call_result result = {0, NULL, 0, NULL};
  result.status = nucleate_call(method, request, strlen(request), NUCLEATE_ENCODING_JSON,
                                &result.reply, &result.reply_size, &result.message);
  return result;
}

static void release(call_result* result) {
  nucleate_free(result->reply);
  nucleate_free(result->message);
}

/* True when the reply holds `needle` within its reply_size bytes. */
static int reply_contains(const call_result* result, const char* needle) {
  const size_t length = strlen(needle);
  const char* bytes = (const char*)result->reply;
  size_t i;
  if (bytes == NULL || length > result->reply_size) return 0;
  for (i = 0; i + length <= result->reply_size; ++i) {
    if (memcmp(bytes + i, needle, length) == 0) return 1;
  }
  return 0;
}

static void test_version(void) {
  call_result result = call_json("Version", "{}");
  double* values = NULL;
  size_t count = 0;
  char* message = NULL;
  char quoted[64];

  CHECK(strcmp(NUCLEATE_VERSION_STRING, nucleate_version()) == 0);
  CHECK(nucleate_abi_version() == NUCLEATE_ABI_VERSION);
  CHECK(result.status == NUCLEATE_OK);
  CHECK(result.message == NULL);
  CHECK(result.reply != NULL && result.reply_size > 0);
  /* The header promises JSON replies are NUL-terminated beyond reply_size. */
  CHECK(result.reply != NULL && ((const char*)result.reply)[result.reply_size] == '\0');
  snprintf(quoted, sizeof quoted, "\"version\":\"%s\"", NUCLEATE_VERSION_STRING);
  CHECK(reply_contains(&result, quoted));
  CHECK(reply_contains(&result, "\"Schedule\""));
  CHECK(nucleate_reply_doubles("Version", result.reply, result.reply_size, NUCLEATE_ENCODING_JSON,
                               "abi_version", &values, &count, &message) == NUCLEATE_OK);
  CHECK(count == 1 && values != NULL && values[0] == (double)NUCLEATE_ABI_VERSION);
  nucleate_free(values);
  nucleate_free(message);
  release(&result);
}

/* Reads one column of a Schedule reply; returns NULL (and checks fail) if it is missing. */
static double* column(const call_result* result, const char* path, size_t* count) {
  double* values = NULL;
  char* message = NULL;
  const nucleate_status status =
      nucleate_reply_doubles("Schedule", result->reply, result->reply_size,
                             NUCLEATE_ENCODING_JSON, path, &values, count, &message);
  CHECK(status == NUCLEATE_OK);
  CHECK(message == NULL);
  nucleate_free(message);
  return values;
}

static void test_linear_schedule(void) {
  call_result result =
      call_json("Schedule", "{\"variance\":{\"kind\":\"VARIANCE_KIND_LINEAR\",\"steps\":10}}");
  size_t n_beta = 0, n_alpha_bar = 0, n_t = 0, i;
  double *beta, *alpha_bar, *t;
  CHECK(result.status == NUCLEATE_OK);
  beta = column(&result, "variance_steps.beta", &n_beta);
  alpha_bar = column(&result, "variance_steps.alpha_bar", &n_alpha_bar);
  t = column(&result, "variance_steps.t", &n_t);
  CHECK(n_beta == 10 && n_alpha_bar == 10 && n_t == 10);
  if (n_beta == 10 && n_alpha_bar == 10 && n_t == 10) {
    CHECK(fabs(beta[0] - HO_BETA_START) <= ENDPOINT_TOLERANCE);
    CHECK(fabs(beta[9] - HO_BETA_END) <= ENDPOINT_TOLERANCE);
    for (i = 0; i < 10; ++i) {
      /* Evenly spaced (Ho et al. 2020), steps numbered from 1, alpha_bar the running product. */
      const double expected = HO_BETA_START + (HO_BETA_END - HO_BETA_START) * (double)i / 9.0;
      CHECK(fabs(beta[i] - expected) <= 1e-15);
      CHECK(t[i] == (double)(i + 1));
      if (i > 0) CHECK(alpha_bar[i] < alpha_bar[i - 1]);
    }
    CHECK(fabs(alpha_bar[0] - (1.0 - HO_BETA_START)) <= 1e-15);
  }
  /* A path that does not exist names itself. */
  {
    double* values = NULL;
    size_t count = 0;
    char* message = NULL;
    CHECK(nucleate_reply_doubles("Schedule", result.reply, result.reply_size,
                                 NUCLEATE_ENCODING_JSON, "variance_steps.no_such_field", &values,
                                 &count, &message) == NUCLEATE_ERROR_INVALID_ARGUMENT);
    CHECK(message != NULL && strstr(message, "no_such_field") != NULL);
    nucleate_free(values);
    nucleate_free(message);
  }
  nucleate_free(beta);
  nucleate_free(alpha_bar);
  nucleate_free(t);
  release(&result);
}

/* Every failed call returns a one-line message (nucleate.h, ErrorDetail.message). */
static int one_line(const char* message) {
  return message != NULL && message[0] != '\0' && strchr(message, '\n') == NULL;
}

static void test_errors(void) {
  {
    call_result result = call_json("NoSuchMethod", "{}");
    CHECK(result.status == NUCLEATE_ERROR_UNKNOWN_METHOD);
    CHECK(one_line(result.message));
    CHECK(reply_contains(&result, "\"code\":1"));
    CHECK(reply_contains(&result, "NoSuchMethod"));
    release(&result);
  }
  {
    call_result result = {0, NULL, 0, NULL};
    result.status = nucleate_call("Version", "{}", 2, 7, &result.reply, &result.reply_size,
                                  &result.message);
    CHECK(result.status == NUCLEATE_ERROR_BAD_ENCODING);
    CHECK(one_line(result.message));
    /* The header: a bad encoding gets a binary ErrorDetail, so the reply is not JSON. */
    CHECK(result.reply != NULL && result.reply_size > 0 &&
          ((const char*)result.reply)[0] != '{');
    release(&result);
  }
  {
    /* A NULL out-pointer: nothing may be touched, not even the other out-parameters. */
    size_t reply_size = 12345;
    char* message = (char*)&reply_size; /* a sentinel that must come back unchanged */
    void* reply = &reply_size;
    CHECK(nucleate_call("Version", "{}", 2, NUCLEATE_ENCODING_JSON, NULL, &reply_size,
                        &message) == NUCLEATE_ERROR_NULL_ARGUMENT);
    CHECK(reply_size == 12345 && message == (char*)&reply_size);
    CHECK(nucleate_call("Version", "{}", 2, NUCLEATE_ENCODING_JSON, &reply, NULL, &message) ==
          NUCLEATE_ERROR_NULL_ARGUMENT);
    CHECK(reply == &reply_size && message == (char*)&reply_size);
  }
  {
    call_result result = call_json("Schedule", "{\"variance\":{\"steps\":0}}");
    CHECK(result.status == NUCLEATE_ERROR_INVALID_ARGUMENT);
    CHECK(one_line(result.message));
    CHECK(result.message != NULL && strstr(result.message, "variance.steps") != NULL);
    CHECK(reply_contains(&result, "\"field\":\"variance.steps\""));
    release(&result);
  }
  {
    /* Tag 0x0f is field 1 with wire type 7, which does not exist; then an unterminated varint. */
    static const unsigned char garbage[] = {0x0f, 0xff, 0xff, 0xff, 0xff, 0xff,
                                            0xff, 0xff, 0xff, 0xff, 0xff, 0xff};
    call_result result = {0, NULL, 0, NULL};
    result.status = nucleate_call("Schedule", garbage, sizeof garbage, NUCLEATE_ENCODING_BINARY,
                                  &result.reply, &result.reply_size, &result.message);
    CHECK(result.status == NUCLEATE_ERROR_MALFORMED_REQUEST);
    CHECK(one_line(result.message));
    release(&result);
  }
  {
    /* Truncated JSON: the message must still be one line. */
    call_result result = call_json("Schedule", "{\"variance\":");
    CHECK(result.status == NUCLEATE_ERROR_MALFORMED_REQUEST);
    CHECK(one_line(result.message));
    release(&result);
  }
  CHECK(strcmp(nucleate_status_name(NUCLEATE_ERROR_INVALID_ARGUMENT),
               "NUCLEATE_ERROR_INVALID_ARGUMENT") == 0);
  CHECK(strcmp(nucleate_status_name(NUCLEATE_OK), "NUCLEATE_OK") == 0);
  CHECK(strcmp(nucleate_status_name(9999), "NUCLEATE_STATUS_UNKNOWN") == 0);
  nucleate_free(NULL); /* allowed, does nothing; reaching the next line is the check */
  CHECK(1);
}

typedef struct {
  int log_lines;
  int progress_reports;
  int bad_fraction;
} observer;

static void on_log(int32_t level, const char* line, void* user_data) {
  observer* seen = (observer*)user_data;
  (void)level;
  if (line != NULL) ++seen->log_lines;
}

static int32_t on_progress(double fraction, const char* stage, void* user_data) {
  observer* seen = (observer*)user_data;
  (void)stage;
  ++seen->progress_reports;
  if (!(fraction >= 0.0 && fraction <= 1.0)) ++seen->bad_fraction;
  return 0; /* go on */
}

static void test_observed(void) {
  static const char request[] = "{\"variance\":{\"kind\":\"VARIANCE_KIND_COSINE\",\"steps\":50}}";
  observer seen = {0, 0, 0};
  call_result observed = {0, NULL, 0, NULL};
  call_result plain = call_json("Schedule", request);
  observed.status = nucleate_call_observed("Schedule", request, strlen(request),
                                           NUCLEATE_ENCODING_JSON, on_log, on_progress, &seen,
                                           &observed.reply, &observed.reply_size,
                                           &observed.message);
  CHECK(observed.status == NUCLEATE_OK);
  /* Callbacks observe; they never change the answer. */
  CHECK(plain.status == NUCLEATE_OK && observed.reply_size == plain.reply_size &&
        memcmp(observed.reply, plain.reply, plain.reply_size) == 0);
  CHECK(seen.bad_fraction == 0);
  release(&observed);
  release(&plain);
}

int main(void) {
  test_version();
  test_linear_schedule();
  test_errors();
  test_observed();
  return check_report();
}
