// The extern "C" entry points. Nothing here may throw: every body ends in catch (...).
#include <cstdlib>

#include "dispatch.h"
#include "out_buffer.h"
#include "nucleate/nucleate.h"

using nucleate::capi::CopyOut;

extern "C" {

const char* nucleate_version(void) { return NUCLEATE_VERSION_STRING; }

int32_t nucleate_abi_version(void) { return NUCLEATE_ABI_VERSION; }

void nucleate_free(void* pointer) { std::free(pointer); }

nucleate_status nucleate_call_collective(const char* method, const void* request,
                                         size_t request_size, int32_t encoding,
                                         const nucleate_collective_v1* collective,
                                         nucleate_log_fn log, nucleate_progress_fn progress,
                                         void* user_data, void** reply, size_t* reply_size,
                                         char** message) {
  if (reply == nullptr || reply_size == nullptr) return NUCLEATE_ERROR_NULL_ARGUMENT;
  try {
    const nucleate::capi::CallContext context(log, progress, user_data, collective);
    nucleate::capi::DispatchOutcome outcome =
        nucleate::capi::Dispatch(method, request, request_size, encoding, context);
    char* reply_copy = CopyOut(outcome.reply);
    char* message_copy = nullptr;
    if (outcome.status != NUCLEATE_OK && message != nullptr) {
      message_copy = CopyOut(outcome.message);
    }
    if (reply_copy == nullptr || (outcome.status != NUCLEATE_OK && message != nullptr &&
                                  message_copy == nullptr)) {
      std::free(reply_copy);
      std::free(message_copy);
      return NUCLEATE_ERROR_OUT_OF_MEMORY;
    }
    *reply = reply_copy;
    *reply_size = outcome.reply.size();
    if (message != nullptr) *message = message_copy;
    return outcome.status;
  } catch (...) {
    return NUCLEATE_ERROR_OUT_OF_MEMORY;  // only allocation can throw past Dispatch
  }
}

nucleate_status nucleate_call_observed(const char* method, const void* request,
                                       size_t request_size, int32_t encoding,
                                       nucleate_log_fn log, nucleate_progress_fn progress,
                                       void* user_data, void** reply, size_t* reply_size,
                                       char** message) {
  return nucleate_call_collective(method, request, request_size, encoding, nullptr, log, progress,
                                  user_data, reply, reply_size, message);
}

nucleate_status nucleate_call(const char* method, const void* request, size_t request_size,
                              int32_t encoding, void** reply, size_t* reply_size,
                              char** message) {
  return nucleate_call_observed(method, request, request_size, encoding, nullptr, nullptr,
                                nullptr, reply, reply_size, message);
}

}  // extern "C"
