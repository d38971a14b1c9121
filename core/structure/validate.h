// The checks every structure passes before core computes anything on it.
#pragma once

#include <optional>

#include "core/common/error.h"
#include "core/structure/crystal.h"

namespace nucleate::structure {

// A cell whose |det| is at or below this many cubic angstrom per site is degenerate (real matter
// needs at least ~5 A^3 per atom: diamond has 5.67), and so is a cell whose |det| is at or below
// kMinRelativeVolume * |a| |b| |c| (a cell flattened to a sliver: the sine-like ratio is
// scale-free and catches long nearly coplanar axes that still enclose some volume). Left-handed cells
// (det < 0) are accepted: SignedVolume tells callers which they have.
constexpr double kMinVolumePerSite = 1e-6;   // A^3
constexpr double kMinRelativeVolume = 1e-9;  // |det| / (|a| |b| |c|)

// Raises, naming the exact field and index:
//   LimitExceeded("atomic_numbers")   more sites than limits.max_atoms
//   InvalidArgument("max_atoms")      limits.max_atoms above StructureLimits::kCeilingMaxAtoms or < 1
//   InvalidArgument("atomic_numbers") no sites
//   InvalidArgument("frac_coords")    a different count of coordinates than of atomic numbers
//   InvalidArgument("lattice[k]")     entry k (row-major) of the lattice not finite
//   LimitExceeded("lattice")          a cell vector longer than limits.max_cell_length
//   InvalidArgument("lattice")        a zero-length vector or a degenerate cell (see above)
//   InvalidArgument("atomic_numbers[k]")  Z outside 1..118
//   InvalidArgument("frac_coords[3i+j]")  coordinate j of site i not finite (flat, as in messages)
void ValidateCrystal(const Crystal& crystal, const StructureLimits& limits);

// The first error ValidateCrystal would raise, returned instead of thrown, with whether it is a
// non-finite number: for checks that report a defect rather than refuse the structure.
struct CrystalDefect {
  Error error;
  bool non_finite = false;
};
std::optional<CrystalDefect> FindCrystalDefect(const Crystal& crystal,
                                               const StructureLimits& limits);

}  // namespace nucleate::structure
