// Space-group operations as written in CIF files ("-y+1/2, x-y, z+2/3"): parsing, formatting and
// applying them to fractional coordinates.
#pragma once

#include <string>
#include <string_view>

#include <Eigen/Dense>

#include "core/structure/symmetry_operation.h"

namespace nucleate::structure::io {


// Parses the x,y,z form used by _symmetry_equiv_pos_as_xyz and _space_group_symop_operation_xyz
// (CIF core dictionary): three comma-separated expressions, each a signed sum of x, y, z
// (any case, coefficient +-1) and constants written as integers, fractions ("1/2") or decimals
// ("0.5"), in any order ("1/2+x", "x+1/2"). Spaces are ignored. The rotation must have
// determinant +1 or -1. Throws nucleate::Error (kInvalidArgument) with `field` and a message
// naming the operation on anything else.
SymmetryOperation ParseSymmetryOperation(std::string_view text, const std::string& field);

// The x,y,z form: "-y+1/2, x-y, z+2/3". Translations are wrapped to [0, 1) and written as a
// fraction with denominator up to 12 when one matches within 1e-6, else as a decimal.
std::string FormatSymmetryOperation(const SymmetryOperation& op);

}  // namespace nucleate::structure::io
