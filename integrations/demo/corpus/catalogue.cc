#include "integrations/demo/corpus/catalogue.h"

#include <algorithm>
#include <cmath>
#include <cstdlib>
#include <limits>
#include <set>
#include <string>

#include "core/common/error.h"
#include "core/elements/elements.h"
#include "core/structure/composition.h"
#include "core/structure/lattice.h"
#include "integrations/demo/corpus/corpus_cell.h"
#include "integrations/demo/corpus/radii.h"

namespace nucleate::demo::corpus {
namespace {

using structure::SymmetryOperation;

constexpr double kSameFraction = 1e-6;

bool SameModuloLattice(const Eigen::Vector3d& a, const Eigen::Vector3d& b) {
  for (int k = 0; k < 3; ++k) {
    const double d = a[k] - b[k];
    if (std::abs(d - std::round(d)) > kSameFraction) return false;
  }
  return true;
}

// "24e" -> 24.
int Multiplicity(const char* wyckoff) { return std::atoi(wyckoff); }

// The conventional cell: every site's orbit, checked against its Wyckoff multiplicity and against
// the other sites.
RoleCell ConventionalSites(const StructureType& type, const std::vector<Site>& sites,
                           const std::vector<SymmetryOperation>& operations) {
  RoleCell cell;
  for (std::size_t s = 0; s < sites.size(); ++s) {
    const std::vector<Eigen::Vector3d> orbit = Orbit(operations, sites[s].point);
    const std::string where = std::string(type.name) + " site " + std::to_string(s) + " (" +
                              sites[s].wyckoff + ")";
    if (static_cast<int>(orbit.size()) != Multiplicity(sites[s].wyckoff)) {
      throw Internal(where + " gives " + std::to_string(orbit.size()) +
                     " positions in " + Describe(*type.group) + ", the Tables " +
                     std::to_string(Multiplicity(sites[s].wyckoff)));
    }
    for (const Eigen::Vector3d& point : orbit) {
      for (const Eigen::Vector3d& earlier : cell.frac) {
        if (SameModuloLattice(point, earlier)) throw Internal(where + " overlaps an earlier site");
      }
    }
    for (const Eigen::Vector3d& point : orbit) {
      cell.roles.push_back(sites[s].role);
      cell.frac.push_back(point);
    }
  }
  return cell;
}

// The same atoms in the primitive basis: images related by a centring translation merge.
RoleCell PrimitiveSites(const StructureType& type, const RoleCell& conventional,
                        const Eigen::Matrix3d& transform) {
  const Eigen::Matrix3d to_primitive = transform.inverse();  // row vector f_p = f_c * P^-1
  RoleCell cell;
  for (std::size_t k = 0; k < conventional.frac.size(); ++k) {
    const Eigen::Vector3d point =
        structure::WrapFractional((conventional.frac[k].transpose() * to_primitive).transpose());
    bool known = false;
    for (const Eigen::Vector3d& earlier : cell.frac) known = known || SameModuloLattice(point, earlier);
    if (known) continue;
    cell.roles.push_back(conventional.roles[k]);
    cell.frac.push_back(point);
  }
  const double expected = static_cast<double>(conventional.frac.size()) * std::abs(transform.determinant());
  if (std::abs(static_cast<double>(cell.frac.size()) - expected) > 1e-9) {
    throw Internal(std::string(type.name) + ": the primitive cell holds " +
                   std::to_string(cell.frac.size()) + " atoms, expected " + std::to_string(expected));
  }
  return cell;
}

struct ResolvedRole {
  std::vector<int> numbers;
  std::vector<double> radii;
  std::vector<double> electronegativity;
};

// Element symbols to atomic numbers and radii, with the recipe checked against core's element
// table (common oxidation states) and the radius tables.
std::vector<ResolvedRole> ResolveRecipe(const StructureType& type, std::size_t recipe_index,
                                        const RoleCell& conventional) {
  const Recipe& recipe = type.recipes[recipe_index];
  const std::string where = std::string(type.name) + " recipe " + std::to_string(recipe_index);
  if (recipe.roles.size() != type.roles.size()) {
    throw Internal(where + " fills " + std::to_string(recipe.roles.size()) + " roles, the type has " +
                   std::to_string(type.roles.size()));
  }
  long long charge = 0;
  std::vector<ResolvedRole> resolved(recipe.roles.size());
  for (std::size_t r = 0; r < recipe.roles.size(); ++r) {
    const RoleChoice& choice = recipe.roles[r];
    const long long count = std::count(conventional.roles.begin(), conventional.roles.end(), static_cast<int>(r));
    charge += count * choice.charge;
    if (choice.elements.empty()) throw Internal(where + " role " + type.roles[r] + " has no elements");
    for (const char* symbol : choice.elements) {
      const int z = elements::AtomicNumber(symbol);
      if (z == 0) throw Internal(where + ": '" + symbol + "' is not an element symbol");
      const elements::Element& element = *elements::FindElement(z);
      const std::vector<int>& states = element.common_oxidation_states;
      if (recipe.bonding == Bonding::kIonic) {
        if (choice.charge == 0 ||
            std::find(states.begin(), states.end(), choice.charge) == states.end()) {
          throw Internal(where + ": " + symbol + " " + std::to_string(choice.charge) +
                         " is not a common oxidation state (core/elements)");
        }
        resolved[r].radii.push_back(IonicRadiusOf(z, choice.charge, choice.coordination));
      } else {
        if (std::any_of(states.begin(), states.end(), [](int s) { return s < 0; })) {
          throw Internal(where + ": " + symbol + " has a negative common oxidation state, so core's "
                         "charge check would judge the intermetallic as an ionic compound");
        }
        resolved[r].radii.push_back(MetallicRadiusOf(z));
      }
      resolved[r].numbers.push_back(z);
      resolved[r].electronegativity.push_back(element.electronegativity);
    }
  }
  if (charge != 0) {
    throw Internal(where + ": the charges sum to " + std::to_string(charge) +
                   " over the conventional cell");
  }
  return resolved;
}

// core's electronegativity-order rule: every cation less electronegative than every anion.
bool CationsBelowAnions(const Recipe& recipe, const std::vector<double>& electronegativity) {
  double max_cation = -std::numeric_limits<double>::infinity();
  double min_anion = std::numeric_limits<double>::infinity();
  for (std::size_t r = 0; r < recipe.roles.size(); ++r) {
    if (recipe.roles[r].charge > 0) max_cation = std::max(max_cation, electronegativity[r]);
    if (recipe.roles[r].charge < 0) min_anion = std::min(min_anion, electronegativity[r]);
  }
  return max_cation < min_anion;
}

bool Admissible(const StructureType& type, const Recipe& recipe, const Composition& c,
                const std::vector<double>& electronegativity) {
  if (!recipe.roles_may_share) {
    std::set<int> distinct(c.numbers.begin(), c.numbers.end());
    if (distinct.size() != c.numbers.size()) return false;
  }
  if (recipe.first_two_interchangeable && !(c.numbers[0] < c.numbers[1])) return false;
  if (recipe.bonding == Bonding::kIonic && !CationsBelowAnions(recipe, electronegativity)) return false;
  return !type.plausible || type.plausible(c.radii);
}

void AddCompositions(PreparedType& prepared, std::size_t recipe_index,
                     const std::vector<SymmetryOperation>& operations, const RoleCell& conventional,
                     const RoleCell& primitive, std::set<std::vector<int>>& seen) {
  const StructureType& type = *prepared.type;
  const Recipe& recipe = type.recipes[recipe_index];
  const std::vector<ResolvedRole> roles = ResolveRecipe(type, recipe_index, conventional);
  std::vector<bool> is_anion;
  for (const RoleChoice& choice : recipe.roles) is_anion.push_back(choice.charge < 0);

  std::vector<std::size_t> index(roles.size(), 0);
  while (true) {
    Composition c;
    c.recipe = static_cast<int>(recipe_index);
    c.bonding = recipe.bonding;
    std::vector<double> electronegativity;
    for (std::size_t r = 0; r < roles.size(); ++r) {
      c.numbers.push_back(roles[r].numbers[index[r]]);
      c.charges.push_back(recipe.roles[r].charge);
      c.radii.push_back(roles[r].radii[index[r]]);
      electronegativity.push_back(roles[r].electronegativity[index[r]]);
    }
    if (Admissible(type, recipe, c, electronegativity) && seen.insert(c.numbers).second) {
      c.shape = type.shape;
      if (type.derive_geometry) {
        std::vector<Site> sites = type.sites;
        type.derive_geometry(c.radii, sites, c.shape);
        c.cell = PrimitiveSites(type, ConventionalSites(type, sites, operations),
                                prepared.primitive_transform);
      } else {
        c.cell = primitive;
      }
      const Eigen::Matrix3d unit_primitive =
          prepared.primitive_transform * ConventionalLattice(c.shape, 1.0, Strain{});
      c.a = ContactLength(c.cell, unit_primitive, c.radii, is_anion, recipe.bonding);
      std::vector<int> atoms;
      for (int role : c.cell.roles) atoms.push_back(c.numbers[role]);
      c.formula = structure::ReducedHillFormula(atoms);
      prepared.compositions.push_back(std::move(c));
    }
    // Next tuple, mixed radix with the last role fastest.
    std::size_t r = roles.size();
    while (r > 0 && ++index[r - 1] == roles[r - 1].numbers.size()) index[--r] = 0;
    if (r == 0) break;
  }
}

}  // namespace

double TypeWeight(std::size_t compositions) {
  return std::clamp(std::sqrt(static_cast<double>(compositions)), 4.0, 24.0);
}

std::vector<PreparedType> PrepareCatalogue() {
  std::vector<PreparedType> catalogue;
  for (const StructureType& type : StructureTypes()) {
    PreparedType prepared;
    prepared.type = &type;
    prepared.system = symmetry::CrystalSystemOf(type.group->number);
    prepared.primitive_transform = PrimitiveTransform(type.group->centring);
    const std::vector<SymmetryOperation> operations = ExpandGroup(*type.group);
    const RoleCell conventional = ConventionalSites(type, type.sites, operations);
    const RoleCell primitive = PrimitiveSites(type, conventional, prepared.primitive_transform);
    prepared.conventional_atoms = static_cast<int>(conventional.frac.size());
    prepared.primitive_atoms = static_cast<int>(primitive.frac.size());
    std::set<std::vector<int>> seen;
    for (std::size_t r = 0; r < type.recipes.size(); ++r) {
      AddCompositions(prepared, r, operations, conventional, primitive, seen);
    }
    if (prepared.compositions.empty()) {
      throw Internal(std::string(type.name) + ": no composition passes the filters");
    }
    prepared.weight = TypeWeight(prepared.compositions.size());
    catalogue.push_back(std::move(prepared));
  }
  return catalogue;
}

}  // namespace nucleate::demo::corpus
