/* Rewrites expected_reply.json of every case from what the library replies now. Used only by
   regenerate.sh, and only when a reply change is intended and reviewed. It never rewrites
   expected_status: a case whose status changed is reported and left alone, because a status is
   a decision a person writes down, not an output to accept.
   Usage: regenerate_replies CASES_DIR */
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <nucleate/nucleate.h>

#include "case_files.h"

static int write_reply(const char* directory, const char* name, const void* reply, size_t size) {
  char path[4096];
  FILE* stream;
  int ok;
  snprintf(path, sizeof path, "%s/%s/expected_reply.json", directory, name);
  stream = fopen(path, "wb");
  if (stream == NULL) return 0;
  ok = fwrite(reply, 1, size, stream) == size;
  return fclose(stream) == 0 && ok;
}

int main(int argc, char** argv) {
  size_t count = 0, i;
  int refused = 0;
  char** names;
  if (argc != 2) {
    fprintf(stderr, "usage: %s CASES_DIR\n", argv[0]);
    return 2;
  }
  names = list_case_names(argv[1], &count);
  if (names == NULL) return 1;
  for (i = 0; i < count; ++i) {
    size_t method_size, request_size, status_size, reply_size = 0;
    char* method = read_case_file(argv[1], names[i], "method", &method_size);
    char* request = read_case_file(argv[1], names[i], "request.json", &request_size);
    char* status_text = read_case_file(argv[1], names[i], "expected_status", &status_size);
    void* reply = NULL;
    char* message = NULL;
    if (method == NULL || request == NULL || status_text == NULL) {
      printf("SKIP %s: needs method, request.json and expected_status\n", names[i]);
      ++refused;
    } else {
      nucleate_status status;
      method[strcspn(method, "\r\n")] = '\0';
      status = nucleate_call(method, request, request_size, NUCLEATE_ENCODING_JSON, &reply,
                             &reply_size, &message);
      if (status != strtol(status_text, NULL, 10)) {
        printf("SKIP %s: status is now %d, expected_status says %ld\n", names[i], (int)status,
               strtol(status_text, NULL, 10));
        ++refused;
      } else if (!write_reply(argv[1], names[i], reply, reply_size)) {
        printf("FAIL %s: cannot write expected_reply.json\n", names[i]);
        ++refused;
      } else {
        printf("wrote %s\n", names[i]);
      }
    }
    nucleate_free(reply);
    nucleate_free(message);
    free(method);
    free(request);
    free(status_text);
  }
  free_case_names(names, count);
  return refused == 0 ? 0 : 1;
}
