#include "dispatch.h"

#include <new>

#include "codec.h"
#include "error_detail.h"
#include "core/common/error.h"
#include "methods/assess_method.h"
#include "methods/check_method.h"
#include "methods/convert_method.h"
#include "methods/match_methods.h"
#include "methods/merge_samples_method.h"
#include "methods/model_methods.h"
#include "methods/sample_method.h"
#include "methods/schedule_methods.h"
#include "methods/version_method.h"
#include "nucleate/v1/error.pb.h"
#include "status.h"

namespace nucleate::capi {
namespace {

namespace pb = google::protobuf;

DispatchOutcome Fail(const char* method, int32_t encoding, const CallFailure& failure) {
  DispatchOutcome outcome;
  outcome.status = failure.status;
  outcome.message = OneLine(failure.message);
  nucleate::v1::ErrorDetail detail;
  FillErrorDetail(failure.status, outcome.message, failure.field, method ? method : "", &detail);
  const int32_t reply_encoding =
      encoding == NUCLEATE_ENCODING_JSON ? NUCLEATE_ENCODING_JSON : NUCLEATE_ENCODING_BINARY;
  try {
    outcome.reply = EncodeMessage(detail, reply_encoding);
  } catch (...) {
    outcome.reply.clear();  // the status and message still reach the caller
  }
  return outcome;
}

// A collective must describe this process sensibly, and only a method that shares its work may
// run with more than one process.
void CheckCollective(const char* method, const MethodEntry& entry,
                     const nucleate_collective_v1* c) {
  if (c == nullptr) return;
  const auto refuse = [&](const std::string& field, const std::string& detail) {
    throw CallFailure{NUCLEATE_ERROR_INVALID_ARGUMENT, field,
                      std::string(method) + ": " + field + ": " + detail};
  };
  if (c->struct_size < sizeof(nucleate_collective_v1)) {
    refuse("collective.struct_size", "is " + std::to_string(c->struct_size) + "; expected " +
                                         std::to_string(sizeof(nucleate_collective_v1)));
  }
  if (c->size < 1) refuse("collective.size", "must be >= 1, got " + std::to_string(c->size));
  if (c->rank < 0 || c->rank >= c->size) {
    refuse("collective.rank", std::to_string(c->rank) + " is outside 0.." +
                                  std::to_string(c->size - 1));
  }
  if (c->size > 1 && c->sum_doubles == nullptr) {
    refuse("collective.sum_doubles", "required when size > 1");
  }
  if (c->size > 1 && !entry.spans_processes) {
    refuse("collective", "this method runs within one process; of the methods only Train "
                         "spreads over processes (call it once, or split Sample by first_index)");
  }
}

}  // namespace

const MethodEntry* FindMethod(const char* method) {
  for (const MethodEntry& entry : Methods()) {
    if (std::string(entry.name) == method) return &entry;
  }
  return nullptr;
}

const std::vector<MethodEntry>& Methods() {
  static const std::vector<MethodEntry> kMethods = {
      VersionMethod(),
      ScheduleMethod(),
      DesignScheduleMethod(),
      WrappedNormalMethod(),
      CheckMethod(),
      MatchMethod(),
      DedupMethod(),
      ConvertMethod(),
      TrainMethod(),
      ModelInfoMethod(),
      EvaluateMethod(),
      SampleMethod(),
      AssessMethod(),
      MergeSamplesMethod(),
  };
  return kMethods;
}

DispatchOutcome Dispatch(const char* method, const void* request, size_t request_size,
                         int32_t encoding, const CallContext& context) {
  try {
    if (method == nullptr) {
      throw CallFailure{NUCLEATE_ERROR_NULL_ARGUMENT, "", "method name is NULL"};
    }
    if (encoding != NUCLEATE_ENCODING_BINARY && encoding != NUCLEATE_ENCODING_JSON) {
      throw CallFailure{NUCLEATE_ERROR_BAD_ENCODING, "",
                    std::string(method) + ": encoding " + std::to_string(encoding) +
                        " is neither NUCLEATE_ENCODING_BINARY (0) nor NUCLEATE_ENCODING_JSON (1)"};
    }
    const MethodEntry* entry = FindMethod(method);
    if (entry == nullptr) {
      throw CallFailure{NUCLEATE_ERROR_UNKNOWN_METHOD, "",
                    "unknown method '" + std::string(method) +
                        "'; the Version method lists the methods this library knows"};
    }
    CheckCollective(method, *entry, context.collective());
    if (request == nullptr && request_size != 0) {
      throw CallFailure{NUCLEATE_ERROR_NULL_ARGUMENT, "",
                    std::string(method) + ": request is NULL but request_size is " +
                        std::to_string(request_size)};
    }
    if (request_size > kMaxRequestBytes) {
      throw CallFailure{NUCLEATE_ERROR_LIMIT_EXCEEDED, "",
                    std::string(method) + ": request of " + std::to_string(request_size) +
                        " bytes is over the limit of " + std::to_string(kMaxRequestBytes)};
    }
    std::unique_ptr<pb::Message> parsed(entry->request_prototype().New());
    std::unique_ptr<pb::Message> reply(entry->reply_prototype().New());
    DecodeMessage(request == nullptr ? "" : request, request_size, encoding,
                  std::string(method) + ": request", parsed.get());
    entry->handler(*parsed, reply.get(), context);
    DispatchOutcome outcome;
    outcome.reply = EncodeMessage(*reply, encoding);
    if (context.cancelled()) {
      // The reply keeps what was finished before the caller asked to stop.
      outcome.status = NUCLEATE_ERROR_CANCELLED;
      outcome.message = std::string(method) +
                        ": cancelled by the progress callback; the reply holds the finished part";
    }
    return outcome;
  } catch (const CallFailure& failure) {
    return Fail(method, encoding, failure);
  } catch (const Error& error) {
    return Fail(method, encoding,
                CallFailure{StatusForErrorKind(error.kind()), error.field(),
                        std::string(method) + ": " + error.message()});
  } catch (const std::bad_alloc&) {
    return Fail(method, encoding,
                CallFailure{NUCLEATE_ERROR_OUT_OF_MEMORY, "",
                        std::string(method ? method : "") +
                                ": out of memory: an allocation failed; nothing of this call was "
                                "kept (ask for less, or give the process more memory)"});
  } catch (const std::exception& error) {
    return Fail(method, encoding,
                CallFailure{NUCLEATE_ERROR_INTERNAL, "",
                        std::string(method ? method : "") + ": internal error: " + error.what()});
  } catch (...) {
    return Fail(method, encoding,
                CallFailure{NUCLEATE_ERROR_INTERNAL, "",
                        std::string(method ? method : "") + ": internal error"});
  }
}

}  // namespace nucleate::capi
