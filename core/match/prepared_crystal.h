// A crystal brought into the form the matcher compares: validated, reduced to a primitive cell
// (optional), expressed in its shortest basis, rescaled to one cubic length unit per atom
// (optional), sites grouped by element. Dedup prepares each structure once and matches the
// prepared forms many times.
#pragma once

#include <string>
#include <utility>
#include <vector>

#include <Eigen/Dense>

#include "core/match/tolerances.h"
#include "core/structure/crystal.h"

namespace nucleate::match {

struct PreparedCrystal {
  Eigen::Matrix3d lattice = Eigen::Matrix3d::Identity();  // rows: shortest basis, right-handed
  std::vector<int> numbers;                               // ascending atomic number
  std::vector<Eigen::Vector3d> frac;                      // in `lattice`, wrapped to [0, 1)
  // One entry per element, ascending Z: [begin, end) of its sites.
  std::vector<std::pair<int, int>> blocks;
  std::vector<int> block_numbers;
  std::vector<int> reduced_counts;  // per block: count / gcd of all counts
  std::string formula;              // "Z:count ..." of the reduced formula, e.g. "11:1 17:1"
  double volume = 0;                // |det lattice| (N when the volume was rescaled)
  double scale = 1;                 // factor applied to the lengths of the primitive cell

  std::size_t size() const { return numbers.size(); }
};

// Raises what ValidateCrystal raises for a malformed crystal and InvalidArgument for bad
// tolerances.
PreparedCrystal Prepare(const structure::Crystal& crystal, const MatchTolerances& tolerances);

}  // namespace nucleate::match
