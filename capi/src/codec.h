// Bytes to messages and back, in either encoding, for requests, replies and error details.
#pragma once

#include <string>

#include <google/protobuf/message.h>

#include "nucleate/nucleate.h"

namespace nucleate::capi {

// A failure found at the boundary itself (bad bytes, bad arguments), as opposed to an error that
// core raised. Carries the status to return.
struct CallFailure {
  nucleate_status status;
  std::string field;
  std::string message;
};

// JSON uses proto field names and prints every field, defaults included.
std::string EncodeMessage(const google::protobuf::Message& message, int32_t encoding);

// Throws CallFailure (NUCLEATE_ERROR_MALFORMED_REQUEST) naming `what` when the bytes do not parse.
// Unknown JSON fields are refused: a misspelt field must not silently take its default.
void DecodeMessage(const void* bytes, size_t size, int32_t encoding, const std::string& what,
                   google::protobuf::Message* message);

}  // namespace nucleate::capi
