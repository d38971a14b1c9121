#include "status.h"

extern "C" const char* nucleate_status_name(nucleate_status status) {
  // Indexed by code; codes are never renumbered, so this list only grows at its end.
  static const char* const kNames[] = {
      "NUCLEATE_OK",
      "NUCLEATE_ERROR_UNKNOWN_METHOD",
      "NUCLEATE_ERROR_BAD_ENCODING",
      "NUCLEATE_ERROR_MALFORMED_REQUEST",
      "NUCLEATE_ERROR_INVALID_ARGUMENT",
      "NUCLEATE_ERROR_LIMIT_EXCEEDED",
      "NUCLEATE_ERROR_OUT_OF_MEMORY",
      "NUCLEATE_ERROR_INTERNAL",
      "NUCLEATE_ERROR_NULL_ARGUMENT",
      "NUCLEATE_ERROR_IO",
      "NUCLEATE_ERROR_CANCELLED",
      "NUCLEATE_ERROR_NUMERICAL",
      "NUCLEATE_ERROR_UNSUPPORTED",
      "NUCLEATE_ERROR_COLLECTIVE",
  };
  constexpr int kCount = sizeof(kNames) / sizeof(kNames[0]);
  if (status < 0 || status >= kCount) return "NUCLEATE_STATUS_UNKNOWN";
  return kNames[status];
}

namespace nucleate::capi {

nucleate_status StatusForErrorKind(ErrorKind kind) {
  switch (kind) {
    case ErrorKind::kInvalidArgument: return NUCLEATE_ERROR_INVALID_ARGUMENT;
    case ErrorKind::kLimitExceeded: return NUCLEATE_ERROR_LIMIT_EXCEEDED;
    case ErrorKind::kNumerical: return NUCLEATE_ERROR_NUMERICAL;
    case ErrorKind::kUnsupported: return NUCLEATE_ERROR_UNSUPPORTED;
    case ErrorKind::kIo: return NUCLEATE_ERROR_IO;
    case ErrorKind::kCancelled: return NUCLEATE_ERROR_CANCELLED;
    case ErrorKind::kInternal: return NUCLEATE_ERROR_INTERNAL;
    case ErrorKind::kCollective: return NUCLEATE_ERROR_COLLECTIVE;
  }
  return NUCLEATE_ERROR_INTERNAL;
}

}  // namespace nucleate::capi
