// A periodic crystal structure as core sees it: plain C++ types, angstrom, atomic numbers.
#pragma once

#include <cstdint>
#include <map>
#include <string>
#include <vector>

#include <Eigen/Dense>

namespace nucleate::structure {

struct Crystal {
  // Rows are the cell vectors a, b, c in Cartesian angstrom (spglib wants columns: converted in
  // core/symmetry only).
  Eigen::Matrix3d lattice = Eigen::Matrix3d::Identity();
  std::vector<int> numbers;             // atomic numbers, one per site
  std::vector<Eigen::Vector3d> frac;    // fractional coordinates, one per site, wrapped to [0, 1)
  std::string label;                    // file name, candidate identifier
  std::map<std::string, double> properties;

  std::size_t size() const { return numbers.size(); }
};

// Sizes checked before anything is allocated for a structure; callers may raise them up to the
// ceilings.
struct StructureLimits {
  static constexpr std::int64_t kDefaultMaxAtoms = 5000;
  static constexpr std::int64_t kCeilingMaxAtoms = 1000000;
  static constexpr double kDefaultMaxCellLength = 500.0;  // angstrom
  std::int64_t max_atoms = kDefaultMaxAtoms;
  double max_cell_length = kDefaultMaxCellLength;
};

}  // namespace nucleate::structure
