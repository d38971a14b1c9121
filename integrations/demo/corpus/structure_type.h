// A textbook structure type as the corpus uses it: its space group, the shape of its conventional
// cell, its occupied Wyckoff positions, and the chemistry that may fill them.
#pragma once

#include <functional>
#include <vector>

#include <Eigen/Dense>

#include "integrations/demo/corpus/space_group.h"

namespace nucleate::demo::corpus {

enum class Bonding {
  kIonic,     // cations and anions in common oxidation states; sized by Shannon's ionic radii
  kMetallic,  // no element with a negative common oxidation state; sized by metallic radii
};

// Conventional cell shape in units of a; angles in degrees. The crystal system decides which of
// these the random strain may change independently (corpus_cell.cc).
struct CellShape {
  double b_over_a = 1, c_over_a = 1;
  double alpha = 90, beta = 90, gamma = 90;
};

// One occupied Wyckoff position.
struct Site {
  int role = 0;                 // index into StructureType::roles: sites of one role hold one element
  const char* wyckoff = "";     // multiplicity and letter as the Tables print them: "4a"
  Eigen::Vector3d point;        // representative, fractional, conventional cell
};

// What may fill a role in one recipe.
struct RoleChoice {
  int charge = 0;             // oxidation state (ionic); 0 for metallic
  int coordination = 12;      // picks the Shannon radius (ionic); metallic radii are 12-fold
  std::vector<const char*> elements;
};

// One way to fill every role: charges that sum to zero over the cell (ionic), element lists.
struct Recipe {
  Bonding bonding = Bonding::kIonic;
  std::vector<RoleChoice> roles;  // one per StructureType::roles, same order
  // Distinct roles hold distinct elements unless this is set (olivine: Mg on both M1 and M2).
  bool roles_may_share = false;
  // Roles 0 and 1 are exchanged by a symmetry of the structure type (the two tetrahedral sites of
  // a quaternary Heusler): count each unordered pair once.
  bool first_two_interchangeable = false;
};

// Radii of the chosen ions, one per role, in angstrom.
using RoleRadii = std::vector<double>;

struct StructureType {
  const char* name = "";       // "rutile"
  const char* prototype = "";  // "TiO2"
  const SpaceGroup* group = nullptr;
  CellShape shape;
  std::vector<const char*> roles;  // "A", "B", "X", ...
  std::vector<Site> sites;
  std::vector<Recipe> recipes;
  // Where the free parameters and the cell shape come from: typical values, from memory.
  const char* parameters_note = "";
  // Optional: compositions for which this returns false are not used (a tolerance-factor window).
  std::function<bool(const RoleRadii&)> plausible;
  const char* plausibility_note = "";
  // Optional: sets free coordinates or the cell shape from the radii instead of typed-in values
  // (the oxygen of a double perovskite sits where both of its bonds have their radius sums).
  std::function<void(const RoleRadii&, std::vector<Site>&, CellShape&)> derive_geometry;
};

// Every structure type of the corpus, in a fixed order (the order of the manifest and of the
// random choice of type).
const std::vector<StructureType>& StructureTypes();

// The parts, kept in separate files by crystal family.
std::vector<StructureType> CubicStructureTypes();
std::vector<StructureType> HexagonalStructureTypes();     // hexagonal and trigonal
std::vector<StructureType> LowerSymmetryStructureTypes();  // tetragonal, orthorhombic, monoclinic

// The space groups those types use, by International Tables number.
const SpaceGroup& GroupNumber(int number);

}  // namespace nucleate::demo::corpus
