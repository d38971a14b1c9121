// The one place in nucleate that calls spglib (Debian 12 ships 2.0.2). Everything here is in
// nucleate's conventions: lattices as ROWS a, b, c in Cartesian angstrom, plain C++ containers,
// nothing owned by spglib survives a call. Every function:
//   - validates the cell first (finite lattice with a non-degenerate volume, at least one atom,
//     finite positions, matching sizes), because spglib 2.0.2 crashes on a lattice holding NaN;
//   - holds one process-wide mutex while inside spglib, because spglib keeps its error state in a
//     static and is not thread-safe;
//   - raises nucleate::Error (kNumerical) instead of returning spglib's NULL / 0.
// Callers outside core/symmetry should use symmetry.h, not this header.
#pragma once

#include <string>
#include <vector>

#include <Eigen/Dense>

#include "core/structure/crystal.h"

namespace nucleate::symmetry::spglib_call {

// A copy of spglib's SpglibDataset. Conventions are spglib's except for lattices, which are
// converted to rows: operations act on fractional column vectors x' = R x + t of the INPUT cell;
// transformation_matrix P and origin_shift p map input to standardised fractional coordinates
// x_s = P x + p (spglib documentation, "Spglib dataset").
struct Dataset {
  int number = 0;
  int hall_number = 0;
  std::string international_symbol;
  std::string hall_symbol;
  std::string choice;
  std::string point_group;
  Eigen::Matrix3d transformation_matrix = Eigen::Matrix3d::Identity();
  Eigen::Vector3d origin_shift = Eigen::Vector3d::Zero();
  std::vector<Eigen::Matrix3i> rotations;
  std::vector<Eigen::Vector3d> translations;
  std::vector<char> wyckoffs;                      // 'a'..'z', one per input site
  std::vector<std::string> site_symmetry_symbols;  // one per input site
  std::vector<int> equivalent_atoms;
  std::vector<int> crystallographic_orbits;
  Eigen::Matrix3d primitive_lattice = Eigen::Matrix3d::Identity();  // rows
  std::vector<int> mapping_to_primitive;
  structure::Crystal standardized;                 // idealised conventional cell (std_*)
  Eigen::Matrix3d std_rotation_matrix = Eigen::Matrix3d::Identity();
  std::vector<int> std_mapping_to_primitive;
};

// Names and classes of a space-group setting, from spglib's internal table (Hall number 1..530).
struct SpacegroupType {
  int number = 0;
  std::string international_short;
  std::string international_full;
  std::string schoenflies;
  std::string hall_symbol;
  std::string choice;
  std::string point_group_international;
  std::string point_group_schoenflies;
};

// Throws InvalidArgument naming the field when `cell` would be unsafe or meaningless to pass to
// spglib. Public so that callers can reject bad input before doing other work.
void ValidateCell(const structure::Crystal& cell);

// spgat_get_dataset. angle_tolerance < 0 selects spglib's default.
Dataset GetDataset(const structure::Crystal& cell, double symprec, double angle_tolerance);

// spgat_standardize_cell. Label is copied; properties are not (the atom count may change).
structure::Crystal StandardizeCell(const structure::Crystal& cell, bool to_primitive,
                                   bool no_idealize, double symprec, double angle_tolerance);

// spg_niggli_reduce / spg_delaunay_reduce on a lattice given as rows; returns the reduced rows.
Eigen::Matrix3d NiggliReduceLattice(const Eigen::Matrix3d& lattice_rows, double eps);
Eigen::Matrix3d DelaunayReduceLattice(const Eigen::Matrix3d& lattice_rows, double eps);

// spg_get_spacegroup_type; throws InvalidArgument if hall_number is not in 1..530.
SpacegroupType GetSpacegroupType(int hall_number);

}  // namespace nucleate::symmetry::spglib_call
