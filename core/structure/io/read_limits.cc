#include "core/structure/io/read_limits.h"

#include <cmath>
#include <string>

#include "core/common/error.h"

namespace nucleate::structure::io {

void CheckReadLimits(const StructureLimits& limits, std::size_t max_line_length,
                     std::int64_t max_count, const char* count_name) {
  if (limits.max_atoms < 1 || limits.max_atoms > StructureLimits::kCeilingMaxAtoms) {
    throw InvalidArgument("limits.max_atoms", "must be between 1 and " +
                                                  std::to_string(StructureLimits::kCeilingMaxAtoms));
  }
  if (!std::isfinite(limits.max_cell_length) || limits.max_cell_length <= 0) {
    throw InvalidArgument("limits.max_cell_length", "must be positive and finite");
  }
  // Shorter lines would refuse ordinary files; the cap exists to bound memory, not to be tight.
  if (max_line_length < 80) throw InvalidArgument("max_line_length", "must be at least 80");
  if (max_count < 1) throw InvalidArgument(count_name, "must be at least 1");
}

}  // namespace nucleate::structure::io
