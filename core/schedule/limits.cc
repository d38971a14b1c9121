#include "core/schedule/limits.h"

#include <string>

#include "core/common/error.h"

namespace nucleate::schedule {
namespace {

void CheckLimit(const char* field, std::int64_t value, std::int64_t floor, std::int64_t ceiling) {
  if (value < floor) {
    throw InvalidArgument(field, "must be at least " + std::to_string(floor) + ", got " +
                                     std::to_string(value));
  }
  if (value > ceiling) {
    throw LimitExceeded(field, std::to_string(value) + " is above the ceiling " +
                                   std::to_string(ceiling));
  }
}

}  // namespace

void ValidateScheduleLimits(const ScheduleLimits& limits) {
  CheckLimit("max_steps", limits.max_steps, 1, ScheduleLimits::kCeilingMaxSteps);
  CheckLimit("max_classes", limits.max_classes, 2, ScheduleLimits::kCeilingMaxClasses);
  CheckLimit("max_matrix_entries", limits.max_matrix_entries, 1,
             ScheduleLimits::kCeilingMaxMatrixEntries);
}

}  // namespace nucleate::schedule
