// The option checks the CIF and extended XYZ readers share.
#pragma once

#include <cstddef>
#include <cstdint>

#include "core/structure/crystal.h"

namespace nucleate::structure::io {

// Raises InvalidArgument naming "limits.max_atoms", "limits.max_cell_length", "max_line_length"
// or `count_name` (the reader's cap on blocks or frames) for a value outside its range.
void CheckReadLimits(const StructureLimits& limits, std::size_t max_line_length,
                     std::int64_t max_count, const char* count_name);

}  // namespace nucleate::structure::io
