// The generic call driven by fuzz input, shared by fuzz_call_json.cc and fuzz_call_binary.cc:
// the first byte picks the method, the rest is its request in one encoding. The C ABI is the
// boundary every language binding and the CLI cross with bytes they got from users, so whatever
// the bytes, a call must return a status and never crash, leak or misbehave.
#pragma once

#include <cstddef>
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <memory>
#include <string>
#include <string_view>
#include <vector>

#include <google/protobuf/descriptor.h>
#include <google/protobuf/message.h>

#include "core/common/utf8.h"
#include "nucleate/nucleate.h"
#include "nucleate/v1/error.pb.h"
#include "nucleate/v1/service.pb.h"

namespace nucleate::fuzz {

// Fuzzed methods, in the order the input's first byte selects them (byte % size). Only append:
// the seed corpora start with indices into this list.
inline const std::vector<std::string>& FuzzedMethods() {
  static const std::vector<std::string> kMethods = {
      "Version", "Schedule", "DesignSchedule", "WrappedNormal", "Check",  "Match",       "Dedup",
      "Convert", "ModelInfo", "Evaluate",      "Sample",        "Assess", "MergeSamples"};
  return kMethods;
}

// Never fuzzed: Train writes the model and checkpoint files its YAML names, so a mutated path
// could overwrite any file the fuzzing user may write. (ModelInfo, Evaluate, Sample and Assess
// only read the files they name: a path that does not exist is an IO error.)
inline const std::vector<std::string>& ExcludedMethods() {
  static const std::vector<std::string> kExcluded = {"Train"};
  return kExcluded;
}

inline bool Contains(const std::vector<std::string>& list, const std::string& name) {
  for (const std::string& entry : list) {
    if (entry == name) return true;
  }
  return false;
}

[[noreturn]] inline void Stop(const std::string& what) {
  std::fprintf(stderr, "fuzz_call: %s\n", what.c_str());
  std::abort();  // libFuzzer saves the input that led here
}

// The lists above must cover exactly what the library dispatches: a method added later is either
// fuzzed or excluded on purpose (does it write files?), never silently skipped, and a method that
// went away would make seeds select the wrong thing. Run once, from LLVMFuzzerInitialize.
inline void CheckMethodListAgainstVersion() {
  void* reply = nullptr;
  size_t reply_size = 0;
  char* message = nullptr;
  const nucleate_status status =
      nucleate_call("Version", nullptr, 0, NUCLEATE_ENCODING_BINARY, &reply, &reply_size, &message);
  nucleate::v1::VersionReply version;
  const bool parsed =
      status == NUCLEATE_OK && version.ParseFromArray(reply, static_cast<int>(reply_size));
  const std::string failure = message ? message : "";
  nucleate_free(reply);
  nucleate_free(message);
  if (!parsed) Stop("the Version method failed at start-up: " + failure);
  for (const std::string& name : version.methods()) {
    if (!Contains(FuzzedMethods(), name) && !Contains(ExcludedMethods(), name)) {
      Stop("Version lists method " + name + ", which call_fuzzing.h neither fuzzes nor excludes");
    }
  }
  for (const std::string& name : FuzzedMethods()) {
    bool listed = false;
    for (const std::string& known : version.methods()) listed = listed || known == name;
    if (!listed) Stop("call_fuzzing.h fuzzes " + name + ", which Version does not list");
  }
}

// Sample and Assess run diffusion chains whose length the request sets (count, compositions,
// candidates): a valid request may ask for hours of work. Cancelling through the progress
// callback after a fixed number of reports bounds each call while still running the code after a
// cancellation. The count, not a clock, so a run is reproducible.
constexpr int kProgressReportsBeforeCancel = 64;

struct CallBudget {
  int progress_reports = 0;
};

inline int32_t CountProgress(double fraction, const char* stage, void* user_data) {
  if (!(fraction >= 0.0 && fraction <= 1.0)) Stop("progress fraction outside [0, 1]");
  if (stage == nullptr) Stop("progress stage is NULL");
  (void)std::strlen(stage);  // the sanitizers check that the string is readable
  auto* budget = static_cast<CallBudget*>(user_data);
  return ++budget->progress_reports > kProgressReportsBeforeCancel ? 1 : 0;
}

inline void ReadLogLine(int32_t level, const char* line, void*) {
  if (level < NUCLEATE_LOG_DEBUG || level > NUCLEATE_LOG_WARNING) Stop("log level out of range");
  if (line == nullptr) Stop("log line is NULL");
  (void)std::strlen(line);
}

// One call. Besides crashes, it stops on what nucleate.h promises never happens: an INTERNAL
// status ("a bug, please report it"), a failure without a one-line message or a success with
// one, a JSON reply without its terminating NUL or not in UTF-8, and a binary reply that does not
// parse as the message the status promises.
inline void CallWithFuzzInput(const uint8_t* data, size_t size, int32_t encoding) {
  if (size == 0) return;
  const std::string& method = FuzzedMethods()[data[0] % FuzzedMethods().size()];
  CallBudget budget;
  void* reply = nullptr;
  size_t reply_size = 0;
  char* message = nullptr;
  const nucleate_status status =
      nucleate_call_observed(method.c_str(), size > 1 ? data + 1 : nullptr, size - 1, encoding,
                             &ReadLogLine, &CountProgress, &budget, &reply, &reply_size, &message);
  std::string broken;
  if (status == NUCLEATE_ERROR_INTERNAL) {
    broken = "INTERNAL status from " + method + ": " + (message ? message : "(no message)");
  } else if (status != NUCLEATE_OK && message == nullptr) {
    broken = "failure without a message from " + method;
  } else if (status == NUCLEATE_OK && message != nullptr) {
    broken = "success with a message from " + method + ": " + message;
  } else if (message != nullptr && std::strchr(message, '\n') != nullptr) {
    broken = "multi-line message from " + method + ": " + message;
  } else if (reply == nullptr && reply_size > 0) {
    broken = "NULL reply with size " + std::to_string(reply_size) + " from " + method;
  } else if (encoding == NUCLEATE_ENCODING_JSON && reply != nullptr &&
             static_cast<const char*>(reply)[reply_size] != '\0') {
    broken = "JSON reply without its terminating NUL from " + method;
  } else if (encoding == NUCLEATE_ENCODING_JSON && reply != nullptr &&
             !nucleate::IsValidUtf8(std::string_view(static_cast<const char*>(reply), reply_size))) {
    broken = "JSON reply from " + method + " is not UTF-8";
  } else if (encoding == NUCLEATE_ENCODING_BINARY && reply != nullptr) {
    // Every reply must parse: a success or cancellation as the method's reply message (from the
    // service in service.proto), a failure as an ErrorDetail.
    const bool failed = status != NUCLEATE_OK && status != NUCLEATE_ERROR_CANCELLED;
    const google::protobuf::Descriptor* type =
        failed ? nucleate::v1::ErrorDetail::descriptor()
               : google::protobuf::DescriptorPool::generated_pool()
                     ->FindServiceByName("nucleate.v1.Nucleate")
                     ->FindMethodByName(method)
                     ->output_type();
    std::unique_ptr<google::protobuf::Message> parsed(
        google::protobuf::MessageFactory::generated_factory()->GetPrototype(type)->New());
    if (!parsed->ParseFromArray(reply, static_cast<int>(reply_size))) {
      broken = "reply from " + method + " (status " + std::to_string(status) +
               ") does not parse as " + type->full_name();
    }
  }
  nucleate_free(reply);
  nucleate_free(message);
  if (!broken.empty()) Stop(broken);
}

}  // namespace nucleate::fuzz
