// Writes CIF 1.1 files: the whole cell in P1, or the symmetrised asymmetric unit with its
// space-group operations. Data names from the CIF core dictionary; every value is written so
// that nucleate's reader, pymatgen and ASE read it back (tests/reference/io).
#pragma once

#include <string>
#include <vector>

#include <Eigen/Dense>

#include "core/structure/crystal.h"
#include "core/structure/io/symmetry_operation.h"

namespace nucleate::structure::io {

// One representative site of a symmetrised structure.
struct SymmetrizedSite {
  std::string label;        // unique in the structure, no whitespace ("Na1")
  int number = 0;           // atomic number
  Eigen::Vector3d frac = Eigen::Vector3d::Zero();
  int multiplicity = 0;     // sites this one generates in the cell (>= 1)
  std::string wyckoff;      // Wyckoff letter ("a", ..., "alpha"), no whitespace
};

// What the symmetry module (core/symmetry) hands over for writing; a test can build it by hand.
struct SymmetrizedCrystal {
  std::string label;                            // data block name
  Eigen::Matrix3d lattice = Eigen::Matrix3d::Identity();  // rows a, b, c; right-handed
  int space_group_number = 0;                   // 1..230
  std::string hm_symbol;                        // Hermann-Mauguin symbol, e.g. "F m -3 m"
  std::vector<SymmetryOperation> operations;    // all operations of the cell, identity included
  std::vector<SymmetrizedSite> sites;
};

// The whole cell as space group P1: one row per site, labels element + running number.
// Cell lengths and volume with 6 decimals, fractional coordinates with 8. Raises InvalidArgument
// naming the field ("lattice", "numbers[3]", "frac[3]") for a structure that cannot be written.
std::string WriteCifP1(const Crystal& crystal);

// The asymmetric unit, the operations and the space group. Raises InvalidArgument naming the
// field ("space_group_number", "operations[2]", "sites[1].label", ...) for inconsistent input.
std::string WriteCifSymmetrized(const SymmetrizedCrystal& crystal);


}  // namespace nucleate::structure::io
