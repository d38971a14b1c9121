#include "error_detail.h"

#include <cstdlib>

#include "status.h"

namespace nucleate::capi {

void FillErrorDetail(nucleate_status status, const std::string& message, const std::string& field,
                     const std::string& method, v1::ErrorDetail* detail) {
  detail->set_code(status);
  detail->set_status(nucleate_status_name(status));
  detail->set_message(message);
  detail->set_field(field);
  detail->set_method(method);
}

void FillErrorDetail(const Error& error, const std::string& method, v1::ErrorDetail* detail) {
  FillErrorDetail(StatusForErrorKind(error.kind()), error.what(), error.field(), method, detail);
  // File readers name their field "<file>:<line>"; split it so callers can point at the line.
  const std::string& field = error.field();
  const std::size_t colon = field.rfind(':');
  if (colon != std::string::npos && colon + 1 < field.size()) {
    char* end = nullptr;
    const long line = std::strtol(field.c_str() + colon + 1, &end, 10);
    if (*end == '\0' && line > 0) {
      detail->set_file(field.substr(0, colon));
      detail->set_line(static_cast<int>(line));
    }
  }
}

}  // namespace nucleate::capi
