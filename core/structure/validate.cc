#include "core/structure/validate.h"

#include <cmath>
#include <sstream>
#include <string>

namespace nucleate::structure {
namespace {

std::string Number(double x) {
  std::ostringstream out;
  out.precision(6);
  out << x;
  return out.str();
}

std::string Indexed(const char* field, std::size_t k) {
  return std::string(field) + "[" + std::to_string(k) + "]";
}

CrystalDefect Invalid(const std::string& field, const std::string& detail, bool non_finite = false) {
  return {InvalidArgument(field, detail), non_finite};
}

}  // namespace

std::optional<CrystalDefect> FindCrystalDefect(const Crystal& crystal,
                                               const StructureLimits& limits) {
  // Sizes first: nothing below should look at a structure larger than the caller allowed.
  if (limits.max_atoms < 1 || limits.max_atoms > StructureLimits::kCeilingMaxAtoms) {
    return Invalid("max_atoms", "must lie in 1.." + std::to_string(StructureLimits::kCeilingMaxAtoms));
  }
  const std::size_t n = crystal.numbers.size();
  if (static_cast<std::int64_t>(n) > limits.max_atoms) {
    return CrystalDefect{LimitExceeded("atomic_numbers",
                                       std::to_string(n) + " sites, above max_atoms " +
                                           std::to_string(limits.max_atoms)),
                         false};
  }
  if (n == 0) return Invalid("atomic_numbers", "a crystal needs at least one site");
  if (crystal.frac.size() != n) {
    return Invalid("frac_coords", std::to_string(crystal.frac.size()) + " coordinates for " +
                                      std::to_string(n) + " atomic numbers");
  }

  for (int r = 0; r < 3; ++r) {
    for (int c = 0; c < 3; ++c) {
      if (!std::isfinite(crystal.lattice(r, c))) {
        return Invalid(Indexed("lattice", 3 * r + c), "is not finite", true);
      }
    }
  }
  static const char* const kAxis[3] = {"a", "b", "c"};
  double length_product = 1;
  for (int r = 0; r < 3; ++r) {
    const double length = crystal.lattice.row(r).norm();
    if (length > limits.max_cell_length) {
      return CrystalDefect{LimitExceeded("lattice", std::string("length of ") + kAxis[r] + " is " +
                                                        Number(length) + " A, above max_cell_length " +
                                                        Number(limits.max_cell_length) + " A"),
                           false};
    }
    if (length == 0) return Invalid("lattice", std::string("cell vector ") + kAxis[r] + " has zero length");
    length_product *= length;
  }
  const double volume = std::fabs(crystal.lattice.determinant());
  if (!(volume > kMinVolumePerSite * static_cast<double>(n)) ||
      !(volume > kMinRelativeVolume * length_product)) {
    return Invalid("lattice", "degenerate cell: |volume| " + Number(volume) + " A^3 for " +
                                  std::to_string(n) + " sites");
  }

  for (std::size_t k = 0; k < n; ++k) {
    const int z = crystal.numbers[k];
    if (z < 1 || z > 118) {
      return Invalid(Indexed("atomic_numbers", k), "atomic number " + std::to_string(z) +
                                                       " is not in 1..118");
    }
  }
  // Indexed like the flat frac_coords of a Structure message (and like lattice above): the
  // caller finds the very number at fault.
  for (std::size_t k = 0; k < n; ++k) {
    for (int j = 0; j < 3; ++j) {
      if (!std::isfinite(crystal.frac[k][j])) {
        return Invalid(Indexed("frac_coords", 3 * k + static_cast<std::size_t>(j)),
                       std::string("is not finite (site ") + std::to_string(k) + ", " +
                           "xyz"[j] + ")",
                       true);
      }
    }
  }
  return std::nullopt;
}

void ValidateCrystal(const Crystal& crystal, const StructureLimits& limits) {
  if (auto defect = FindCrystalDefect(crystal, limits)) throw defect->error;
}

}  // namespace nucleate::structure
