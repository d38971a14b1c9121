// Calls through the C entry points from C++ tests, owning what the library returns.
#pragma once

#include <memory>
#include <string>

#include "nucleate/nucleate.h"

namespace nucleate::test {

struct CallResult {
  nucleate_status status = NUCLEATE_OK;
  std::string reply;
  std::string message;
};

inline CallResult Call(const std::string& method, const std::string& request,
                       int32_t encoding = NUCLEATE_ENCODING_JSON) {
  void* reply = nullptr;
  size_t size = 0;
  char* message = nullptr;
  CallResult result;
  result.status = nucleate_call(method.c_str(), request.data(), request.size(), encoding, &reply,
                                &size, &message);
  if (reply != nullptr) result.reply.assign(static_cast<const char*>(reply), size);
  if (message != nullptr) result.message = message;
  nucleate_free(reply);
  nucleate_free(message);
  return result;
}

}  // namespace nucleate::test
