// The method table: one entry per rpc of nucleate.v1.Nucleate, and the one place that turns
// request bytes into a reply (or an ErrorDetail). nucleate_call and the CLI both come here.
#pragma once

#include <string>
#include <vector>

#include <google/protobuf/message.h>

#include "call_context.h"
#include "nucleate/nucleate.h"

namespace nucleate::capi {

using Handler = void (*)(const google::protobuf::Message& request,
                         google::protobuf::Message* reply, const CallContext& context);

struct MethodEntry {
  const char* name;
  const google::protobuf::Message& (*request_prototype)();
  const google::protobuf::Message& (*reply_prototype)();
  Handler handler;
  // Whether the method shares its work among the processes of nucleate_call_collective; any
  // other method refuses a collective of more than one process.
  bool spans_processes = false;
};

// Turns a typed handler into a table entry; the dispatcher builds the request from the same
// prototype, so the casts below always hold.
template <class Request, class Reply,
          void (*Fn)(const Request&, Reply*, const CallContext&)>
MethodEntry MakeMethod(const char* name) {
  return MethodEntry{
      name,
      []() -> const google::protobuf::Message& { return Request::default_instance(); },
      []() -> const google::protobuf::Message& { return Reply::default_instance(); },
      [](const google::protobuf::Message& request, google::protobuf::Message* reply,
         const CallContext& context) {
        Fn(static_cast<const Request&>(request), static_cast<Reply*>(reply), context);
      }};
}

const std::vector<MethodEntry>& Methods();
// NULL when no method has that name.
const MethodEntry* FindMethod(const char* method);

// Largest request accepted, in bytes (protobuf's own ceiling is 2 GiB).
constexpr size_t kMaxRequestBytes = size_t{512} << 20;

struct DispatchOutcome {
  nucleate_status status = NUCLEATE_OK;
  std::string reply;    // encoded reply, or encoded ErrorDetail on failure
  std::string message;  // one line on failure
};

DispatchOutcome Dispatch(const char* method, const void* request, size_t request_size,
                         int32_t encoding, const CallContext& context);

}  // namespace nucleate::capi
