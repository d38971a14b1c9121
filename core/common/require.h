// Argument checks shared by every core area; each throws nucleate::Error naming the field.
#pragma once

#include <cmath>

#include "core/common/error.h"

namespace nucleate {

inline void RequireFinite(const char* field, double value) {
  if (!std::isfinite(value)) throw InvalidArgument(field, "must be a finite number");
}

inline void RequirePositiveFinite(const char* field, double value) {
  if (!std::isfinite(value) || !(value > 0.0)) {
    throw InvalidArgument(field, "must be a finite number > 0");
  }
}

}  // namespace nucleate
