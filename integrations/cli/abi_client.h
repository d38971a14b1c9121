// The CLI's one door into the library: nucleate_call with protobuf JSON.
#pragma once

#include <functional>
#include <stdexcept>
#include <string>

#include "nucleate/nucleate.h"

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

// Callbacks for long calls; either may be empty. progress returns false to cancel.
struct CallObserver {
  std::function<void(int level, const std::string& line)> log;
  std::function<bool(double fraction, const std::string& stage)> progress;
};

// As CallJson, with log and progress. A call cancelled through `progress` returns the reply of
// what was finished and sets *cancelled; other failures throw CallFailed. With `collective`, the
// call is shared by the processes it describes (nucleate_call_collective).
std::string CallJsonObserved(const std::string& method, const std::string& request_json,
                             const CallObserver& observer, bool* cancelled,
                             const nucleate_collective_v1* collective = nullptr);

}  // namespace nucleate::cli
