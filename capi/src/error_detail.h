// The one place an ErrorDetail message is filled: failed calls, and per-structure errors inside
// a reply that otherwise succeeded.
#pragma once

#include <string>

#include "core/common/error.h"
#include "nucleate/nucleate.h"
#include "nucleate/v1/error.pb.h"

namespace nucleate::capi {

// `file` and `line` are set when the field is written "<file>:<line>" (file readers) or
// "<file>:<line>: <key path>" (the training configuration); `field` is kept as given.
// Messages are one line, whatever the text they quote (protobuf's JSON errors span lines, CIF text
// fields hold newlines): line breaks and tabs become one space, other control bytes "\x07".
std::string OneLine(const std::string& text);

// Fills every field; the message passes through OneLine.
void FillErrorDetail(nucleate_status status, const std::string& message, const std::string& field,
                     const std::string& method, v1::ErrorDetail* detail);

// A core error as a detail, filled as above.
void FillErrorDetail(const Error& error, const std::string& method, v1::ErrorDetail* detail);

}  // namespace nucleate::capi
