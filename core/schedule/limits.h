// Size limits for schedule requests, checked before anything is allocated. The defaults are
// documented in schemas/nucleate/v1/schedule.proto; a caller may raise them per request up to the
// hard ceilings below, which exist so that no request can ask for more memory than a node has.
#pragma once

#include <cstdint>

namespace nucleate::schedule {

struct ScheduleLimits {
  static constexpr std::int64_t kDefaultMaxSteps = 100000;
  static constexpr std::int64_t kCeilingMaxSteps = 10000000;
  static constexpr std::int64_t kDefaultMaxClasses = 256;
  static constexpr std::int64_t kCeilingMaxClasses = 4096;
  // Transition matrices are steps * classes^2 doubles in a reply.
  static constexpr std::int64_t kDefaultMaxMatrixEntries = std::int64_t{1} << 22;
  static constexpr std::int64_t kCeilingMaxMatrixEntries = std::int64_t{1} << 27;

  std::int64_t max_steps = kDefaultMaxSteps;
  std::int64_t max_classes = kDefaultMaxClasses;
  std::int64_t max_matrix_entries = kDefaultMaxMatrixEntries;
};

}  // namespace nucleate::schedule

namespace nucleate::schedule {

// Refuses a limit below its floor or above its ceiling, naming it ("max_steps", ...).
void ValidateScheduleLimits(const ScheduleLimits& limits);

}  // namespace nucleate::schedule
