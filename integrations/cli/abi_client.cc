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

}  // namespace nucleate::cli
