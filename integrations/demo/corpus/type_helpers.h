// Shorthands for writing the structure-type tables (cubic_types.cc, hexagonal_types.cc,
// lower_symmetry_types.cc) as data.
#pragma once

#include <cmath>
#include <utility>
#include <vector>

#include "integrations/demo/corpus/structure_type.h"

namespace nucleate::demo::corpus {

inline Recipe Ionic(std::vector<RoleChoice> roles) {
  Recipe recipe;
  recipe.bonding = Bonding::kIonic;
  recipe.roles = std::move(roles);
  return recipe;
}

// Metallic roles: element lists only (no charge; radii for 12-fold coordination).
inline Recipe Metallic(const std::vector<std::vector<const char*>>& element_lists) {
  Recipe recipe;
  recipe.bonding = Bonding::kMetallic;
  for (const auto& elements : element_lists) recipe.roles.push_back({0, 12, elements});
  return recipe;
}

inline CellShape Hexagonal(double c_over_a) { return {1, c_over_a, 90, 90, 120}; }
inline CellShape Tetragonal(double c_over_a) { return {1, c_over_a, 90, 90, 90}; }
inline CellShape Orthorhombic(double b_over_a, double c_over_a) {
  return {b_over_a, c_over_a, 90, 90, 90};
}
inline CellShape Monoclinic(double b_over_a, double c_over_a, double beta) {
  return {b_over_a, c_over_a, 90, beta, 90};
}

// Goldschmidt's tolerance factor of an ABX3 perovskite.
inline double ToleranceFactor(double r_a, double r_b, double r_x) {
  return (r_a + r_x) / (std::sqrt(2.0) * (r_b + r_x));
}

// The x of O (32e) of a spinel in origin choice 1 at which the tetrahedral bond (to A on 8a) and
// the octahedral bond (to B on 16d) are in the ratio `tetrahedral_over_octahedral`. The bond
// lengths in units of a are sqrt(3) (x - 1/4) and sqrt(3 x^2 - 11/4 x + 43/64) (geometry of the
// Wyckoff positions; the unit test measures them in generated cells). Their ratio rises with x, so
// bisection finds it; the result is kept within 0.355..0.400, wider than the spread of real spinels.
inline double SpinelOxygenParameter(double tetrahedral_over_octahedral) {
  const auto ratio = [](double x) {
    return std::sqrt(3.0) * (x - 0.25) / std::sqrt(3 * x * x - 2.75 * x + 43.0 / 64);
  };
  double low = 0.355, high = 0.400;
  if (tetrahedral_over_octahedral <= ratio(low)) return low;
  if (tetrahedral_over_octahedral >= ratio(high)) return high;
  for (int step = 0; step < 60; ++step) {
    const double mid = 0.5 * (low + high);
    (ratio(mid) < tetrahedral_over_octahedral ? low : high) = mid;
  }
  return 0.5 * (low + high);
}

inline bool InWindow(double value, double low, double high) { return value >= low && value <= high; }

}  // namespace nucleate::demo::corpus
