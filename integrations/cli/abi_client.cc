#include "abi_client.h"

#include <memory>

#include "nucleate/nucleate.h"

namespace nucleate::cli {

std::string CallJson(const std::string& method, const std::string& request_json) {
  void* reply = nullptr;
  size_t reply_size = 0;
  char* message = nullptr;
  const nucleate_status status =
      nucleate_call(method.c_str(), request_json.data(), request_json.size(),
                    NUCLEATE_ENCODING_JSON, &reply, &reply_size, &message);
  std::unique_ptr<void, void (*)(void*)> reply_owner(reply, nucleate_free);
  std::unique_ptr<char, void (*)(void*)> message_owner(message, nucleate_free);
  if (status != NUCLEATE_OK) {
    throw CallFailed(status, std::string(nucleate_status_name(status)) + ": " +
                                 (message != nullptr ? message : "no message"));
  }
  return std::string(static_cast<const char*>(reply), reply_size);
}

namespace {

void ForwardLog(int32_t level, const char* line, void* user_data) {
  const auto* observer = static_cast<const CallObserver*>(user_data);
  if (observer->log) observer->log(level, line);
}

int32_t ForwardProgress(double fraction, const char* stage, void* user_data) {
  const auto* observer = static_cast<const CallObserver*>(user_data);
  return observer->progress && !observer->progress(fraction, stage) ? 1 : 0;
}

}  // namespace

std::string CallJsonObserved(const std::string& method, const std::string& request_json,
                             const CallObserver& observer, bool* cancelled,
                             const nucleate_collective_v1* collective) {
  void* reply = nullptr;
  size_t reply_size = 0;
  char* message = nullptr;
  const nucleate_status status = nucleate_call_collective(
      method.c_str(), request_json.data(), request_json.size(), NUCLEATE_ENCODING_JSON,
      collective, &ForwardLog, &ForwardProgress, const_cast<CallObserver*>(&observer), &reply,
      &reply_size, &message);
  std::unique_ptr<void, void (*)(void*)> reply_owner(reply, nucleate_free);
  std::unique_ptr<char, void (*)(void*)> message_owner(message, nucleate_free);
  *cancelled = status == NUCLEATE_ERROR_CANCELLED;
  if (status != NUCLEATE_OK && !*cancelled) {
    throw CallFailed(status, std::string(nucleate_status_name(status)) + ": " +
                                 (message != nullptr ? message : "no message"));
  }
  return std::string(static_cast<const char*>(reply), reply_size);
}

}  // namespace nucleate::cli
