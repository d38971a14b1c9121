// Typed errors raised by core. The C boundary (capi/) maps each kind to a status code; core itself
// knows nothing of codes or wire formats.
#pragma once

#include <stdexcept>
#include <string>

namespace nucleate {

enum class ErrorKind {
  kInvalidArgument,  // a field holds a value outside its domain (NaN, negative, out of order)
  kLimitExceeded,    // a size is above the documented limit the caller may raise
  kNumerical,        // a computation lost meaning (overflow, no convergence)
  kUnsupported,      // a valid request that this version does not handle
  kIo,               // a file could not be read or written
  kCancelled,        // the caller's progress callback asked to stop
  kInternal,         // a broken invariant inside nucleate: a bug
  kCollective,       // the caller's sum over processes failed (data-parallel training)
};

// Every error carries the request field (or file and line) it is about, so the message a
// Fortran driver prints tells the user what to change.
class Error : public std::runtime_error {
 public:
  Error(ErrorKind kind, std::string field, std::string detail)
      : std::runtime_error(field.empty() ? detail : field + ": " + detail),
        kind_(kind),
        field_(std::move(field)),
        detail_(std::move(detail)) {}

  ErrorKind kind() const { return kind_; }
  // what() as a std::string, whole: what() is a C string, cut at the first NUL that quoted file
  // content may hold.
  std::string message() const { return field_.empty() ? detail_ : field_ + ": " + detail_; }
  const std::string& field() const { return field_; }
  const std::string& detail() const { return detail_; }

  // The same error, its field placed inside an enclosing message field ("variance" + "beta_end"
  // gives "variance.beta_end"), so callers see the path as written in their request.
  Error WithinField(const std::string& parent) const {
    return Error(kind_, field_.empty() ? parent : parent + "." + field_, detail_);
  }

 private:
  ErrorKind kind_;
  std::string field_;
  std::string detail_;
};

inline Error InvalidArgument(const std::string& field, const std::string& message) {
  return Error(ErrorKind::kInvalidArgument, field, message);
}
inline Error LimitExceeded(const std::string& field, const std::string& message) {
  return Error(ErrorKind::kLimitExceeded, field, message);
}
inline Error Numerical(const std::string& field, const std::string& message) {
  return Error(ErrorKind::kNumerical, field, message);
}
inline Error Internal(const std::string& message) {
  return Error(ErrorKind::kInternal, "", message);
}

}  // namespace nucleate
