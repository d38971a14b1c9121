// The structure types made ready for generation: operations expanded, Wyckoff multiplicities
// checked, primitive cells built, and every admissible composition listed with its radii and the
// cell size that puts its tightest contact at the radius sum.
#pragma once

#include <string>
#include <vector>

#include <Eigen/Dense>

#include "core/symmetry/symmetry.h"
#include "integrations/demo/corpus/structure_type.h"

namespace nucleate::demo::corpus {

// The atoms of a primitive cell by role; fractional coordinates in the primitive basis, [0, 1).
struct RoleCell {
  std::vector<int> roles;
  std::vector<Eigen::Vector3d> frac;
};

struct Composition {
  int recipe = 0;                // index into StructureType::recipes
  Bonding bonding = Bonding::kIonic;
  std::vector<int> numbers;      // atomic number per role
  std::vector<int> charges;      // oxidation state per role (0 for metallic)
  RoleRadii radii;               // angstrom per role
  CellShape shape;               // the type's, or its own when the type derives it
  RoleCell cell;                 // unit-scale primitive cell (its own when the type derives it)
  double a = 0;                  // conventional a (angstrom) that sets the tightest contact
  std::string formula;           // reduced Hill formula, the key of the split by composition
};

struct PreparedType {
  const StructureType* type = nullptr;
  symmetry::CrystalSystem system = symmetry::CrystalSystem::kTriclinic;
  Eigen::Matrix3d primitive_transform = Eigen::Matrix3d::Identity();
  int conventional_atoms = 0;
  int primitive_atoms = 0;
  std::vector<Composition> compositions;
  double weight = 0;  // relative chance of the type being drawn
};

// Everything in StructureTypes(), in that order. Raises nucleate::Error (kInternal) naming the
// type and the table entry for a mistake in the tables: a generator set that does not close to
// the Tables' order, an orbit whose size is not its Wyckoff multiplicity, overlapping sites, a
// recipe whose charges do not balance or whose state is not a common one, a missing radius, a
// metallic element with a negative common state, or a type left without compositions.
std::vector<PreparedType> PrepareCatalogue();

// Relative chance of a type with n admissible compositions: sqrt(n) within [4, 24], so that rich
// families (quaternary Heuslers) supply many distinct compositions without swamping the corpus,
// and a type with two compositions (baddeleyite) still appears about 1 % of the time.
double TypeWeight(std::size_t compositions);

}  // namespace nucleate::demo::corpus
