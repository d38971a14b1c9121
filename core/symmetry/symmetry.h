// Space-group analysis, standard cells, symmetrisation and cell reduction of a Crystal.
// All of it goes through spglib (core/symmetry/spglib_call.h), serialised and guarded; bad input
// (NaN, degenerate cell, no atoms) raises InvalidArgument, and "no space group found at this
// tolerance" raises kNumerical naming symprec. Tolerances: symprec in angstrom (spglib's
// distance tolerance), angle_tolerance in degrees, negative = spglib's default.
#pragma once

#include <string>
#include <vector>

#include <Eigen/Dense>

#include "core/structure/crystal.h"
#include "core/structure/symmetry_operation.h"

namespace nucleate::symmetry {

constexpr double kDefaultSymprec = 0.1;          // angstrom
constexpr double kDefaultAngleTolerance = -1.0;  // spglib's default

enum class CrystalSystem { kTriclinic, kMonoclinic, kOrthorhombic, kTetragonal, kTrigonal,
                           kHexagonal, kCubic };

// From the space-group number by the ranges of the International Tables for Crystallography,
// Vol. A: 1-2, 3-15, 16-74, 75-142, 143-167, 168-194, 195-230. InvalidArgument outside 1..230.
CrystalSystem CrystalSystemOf(int space_group_number);
const char* CrystalSystemName(CrystalSystem system);  // "triclinic", ..., "cubic"

using structure::SymmetryOperation;

struct SymmetryInfo {
  int number = 0;                  // space-group type, 1..230
  std::string international;       // short Hermann-Mauguin symbol as spglib spells it: "P6_3mc"
  std::string schoenflies;         // "C6v^4"
  int hall_number = 0;             // 1..530: the setting spglib standardises to
  std::string hall_symbol;
  std::string choice;              // origin choice / axes ("1", "2", "H", "R", "b", ...) or ""
  std::string point_group;         // international point-group symbol: "6mm"
  CrystalSystem crystal_system = CrystalSystem::kTriclinic;
  // Per input site, in input order:
  std::vector<char> wyckoffs;                      // letters in the standard setting
  std::vector<std::string> site_symmetry_symbols;  // oriented site symmetry, e.g. "-43m"
  std::vector<int> equivalent_atoms;               // index of the representative of each site
  // Operations of the space group in the INPUT cell's basis (a supercell lists its pure
  // translations too).
  std::vector<SymmetryOperation> operations;
  // Input -> standard setting: x_std = transformation_matrix * x + origin_shift (spglib's
  // convention); in nucleate's row lattices L_std_unrotated = transformation_matrix^-T * L.
  Eigen::Matrix3d transformation_matrix = Eigen::Matrix3d::Identity();
  Eigen::Vector3d origin_shift = Eigen::Vector3d::Zero();
  Eigen::Matrix3d primitive_lattice = Eigen::Matrix3d::Identity();  // rows, angstrom
  std::vector<int> mapping_to_primitive;           // per input site
  double symprec = kDefaultSymprec;                // the tolerances that produced this result
  double angle_tolerance = kDefaultAngleTolerance;

  double PrimitiveVolume() const { return std::abs(primitive_lattice.determinant()); }
};

SymmetryInfo AnalyseSymmetry(const structure::Crystal& crystal, double symprec = kDefaultSymprec,
                             double angle_tolerance = kDefaultAngleTolerance);

// Standardised cells (spglib's spg_standardize_cell), in the standard setting of the space group
// found at the tolerance. With idealise = false (no_idealize=1) the cell keeps the input's own
// distortions and orientation, only re-expressed in the standard basis; with idealise = true the
// lattice and positions are made exactly symmetric and the lattice is rotated to spglib's
// standard orientation. Label is copied, properties are not (the atom count may change).
structure::Crystal StandardConventionalCell(const structure::Crystal& crystal,
                                            double symprec = kDefaultSymprec,
                                            double angle_tolerance = kDefaultAngleTolerance,
                                            bool idealise = false);
structure::Crystal StandardPrimitiveCell(const structure::Crystal& crystal,
                                         double symprec = kDefaultSymprec,
                                         double angle_tolerance = kDefaultAngleTolerance,
                                         bool idealise = false);

// The structure made exactly symmetric at the tolerance: spglib's idealised standardised
// conventional cell, taken from spg_standardize_cell with to_primitive=0, no_idealize=0 (the same
// cell as the dataset's std_lattice / std_positions). Standard setting and orientation.
structure::Crystal Symmetrise(const structure::Crystal& crystal, double symprec = kDefaultSymprec,
                              double angle_tolerance = kDefaultAngleTolerance);

// Reduced cells of the same lattice (spg_niggli_reduce / spg_delaunay_reduce with tolerance eps,
// angstrom-scale as spglib applies it). The atoms keep their Cartesian positions: fractional
// coordinates are re-expressed in the new basis and wrapped to [0, 1). Label and properties are
// copied (same atoms, same cell volume).
structure::Crystal NiggliReduce(const structure::Crystal& crystal, double eps = 1e-5);
structure::Crystal DelaunayReduce(const structure::Crystal& crystal, double eps = 1e-5);

// One representative per class of symmetry-equivalent sites (spglib's equivalent_atoms), in the
// order the representatives appear in the cell that was analysed.
struct AsymmetricSite {
  int site = 0;                    // index of the representative in the analysed cell
  int number = 0;                  // atomic number
  Eigen::Vector3d frac = Eigen::Vector3d::Zero();
  char wyckoff = 'a';
  std::string site_symmetry;
  int multiplicity = 0;            // sites of this class in the analysed cell
};
// `info` must come from AnalyseSymmetry(crystal, ...); InvalidArgument if the sizes disagree.
std::vector<AsymmetricSite> AsymmetricUnit(const structure::Crystal& crystal,
                                           const SymmetryInfo& info);

// What a CIF writer needs to write a structure in its space group's standard setting: the
// idealised conventional cell, its symmetry (operations in that cell's basis, centring
// translations included, Wyckoff multiplicities as in the International Tables), and its
// asymmetric unit.
struct StandardSetting {
  structure::Crystal cell;
  SymmetryInfo info;
  std::vector<AsymmetricSite> asymmetric_unit;
};
StandardSetting StandardSettingForCif(const structure::Crystal& crystal,
                                      double symprec = kDefaultSymprec,
                                      double angle_tolerance = kDefaultAngleTolerance);

}  // namespace nucleate::symmetry
