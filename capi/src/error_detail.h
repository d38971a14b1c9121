// The one place an ErrorDetail message is filled: failed calls, and per-structure errors inside
// a reply that otherwise succeeded.
#pragma once

#include <string>

#include "core/common/error.h"
#include "nucleate/nucleate.h"
#include "nucleate/v1/error.pb.h"

namespace nucleate::capi {

void FillErrorDetail(nucleate_status status, const std::string& message, const std::string& field,
                     const std::string& method, v1::ErrorDetail* detail);

// A core error as a detail; `file` and `line` come from a field written "<file>:<line>".
void FillErrorDetail(const Error& error, const std::string& method, v1::ErrorDetail* detail);

}  // namespace nucleate::capi
