// The CLI's one door into the library: nucleate_call with protobuf JSON.
#pragma once

#include <stdexcept>
#include <string>

namespace nucleate::cli {

// A failed call: the library's status and its one-line message.
class CallFailed : public std::runtime_error {
 public:
  CallFailed(int status, const std::string& message)
      : std::runtime_error(message), status_(status) {}
  int status() const { return status_; }

 private:
  int status_;
};

// Returns the reply JSON, or throws CallFailed.
std::string CallJson(const std::string& method, const std::string& request_json);

}  // namespace nucleate::cli
