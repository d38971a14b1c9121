// Symmetry expansion of an asymmetric unit: every operation applied to every site, images wrapped
// into [0, 1) and coincident images merged.
#pragma once

#include <cstdint>
#include <string>
#include <vector>

#include <Eigen/Dense>

#include "core/structure/io/symmetry_operation.h"

namespace nucleate::structure::io {

struct AsymmetricSite {
  int number = 0;             // atomic number
  Eigen::Vector3d frac;       // as read, not necessarily wrapped
  std::string label;          // names the site in errors and warnings
  std::string where;          // "<file>:<line>" of the site, the field of its errors
};

struct ExpandedSites {
  std::vector<int> numbers;
  std::vector<Eigen::Vector3d> frac;  // wrapped to [0, 1)
  std::vector<std::string> warnings;
};

// Two images closer than `tolerance` angstrom (periodic Cartesian distance) are one site: images
// of a site on a special position coincide only up to the rounding of its printed coordinates,
// and a Cartesian tolerance means the same physical distance in every cell, unlike a fractional
// one. The first image is kept. Images of two different listed sites that coincide are merged
// with a warning when they hold the same element, and raise kUnsupported (two elements on one
// site is disorder) otherwise. Raises kLimitExceeded as soon as more than `max_atoms` distinct
// sites appear, before storing them.
ExpandedSites ExpandSites(const Eigen::Matrix3d& lattice, const std::vector<AsymmetricSite>& sites,
                          const std::vector<SymmetryOperation>& operations, double tolerance,
                          std::int64_t max_atoms);

}  // namespace nucleate::structure::io
