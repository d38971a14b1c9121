// The one reading of a caller's thread count. Workers keep per-thread scratch (dedup buffers,
// training gradients), so a count is refused above a ceiling before anything is allocated.
#pragma once

#include <algorithm>
#include <cstdint>
#include <string>
#include <thread>

#include "core/common/error.h"

namespace nucleate {

// Far above any node's cores today; a count beyond it is a mistake, not a request.
constexpr std::int64_t kMaxThreads = 1024;

// 0 means every hardware thread. InvalidArgument(field) below 0, LimitExceeded(field) above
// kMaxThreads.
inline int ResolveThreadCount(std::int64_t requested, const std::string& field = "threads") {
  if (requested < 0) throw InvalidArgument(field, "must be >= 0 (0 = every core)");
  if (requested > kMaxThreads) {
    throw LimitExceeded(field, std::to_string(requested) + " is above the ceiling of " +
                                   std::to_string(kMaxThreads) + " threads");
  }
  if (requested == 0) return static_cast<int>(std::max(1u, std::thread::hardware_concurrency()));
  return static_cast<int>(requested);
}

}  // namespace nucleate
