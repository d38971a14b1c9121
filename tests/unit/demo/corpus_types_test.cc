// Each structure type of the demo corpus, built unstrained for every composition it admits:
// space group, atom count, one orbit per Wyckoff site, charge neutrality, validity, and the
// contacts that size the cell.
#include <algorithm>
#include <cmath>
#include <map>
#include <set>
#include <string>

#include <gtest/gtest.h>

#include "core/checks/validity.h"
#include "core/common/error.h"
#include "core/random/random_stream.h"
#include "core/structure/periodic_distances.h"
#include "core/symmetry/symmetry.h"
#include "integrations/demo/corpus/catalogue.h"
#include "integrations/demo/corpus/corpus.h"
#include "integrations/demo/corpus/corpus_cell.h"
#include "integrations/demo/corpus/space_group.h"

namespace nucleate::demo::corpus {
namespace {

struct Expected {
  int space_group;  // International Tables number
  int atoms;        // per primitive cell
  const char* source;
};

// Space groups: International Tables for Crystallography, Vol. A, numbers of the space groups in
// which each prototype is described (the structure types themselves: from memory). Atoms per
// primitive cell: the prototype's formula units per primitive cell times the atoms per formula
// (from memory). Typed here independently of the generator's tables.
const std::map<std::string, Expected>& ExpectedTypes() {
  static const std::map<std::string, Expected> expected = {
      {"rock_salt", {225, 2, "NaCl, Fm-3m, Z = 1 per primitive cell"}},
      {"caesium_chloride", {221, 2, "CsCl, Pm-3m, Z = 1"}},
      {"zinc_blende", {216, 2, "ZnS sphalerite, F-43m, Z = 1 per primitive cell"}},
      {"fluorite", {225, 3, "CaF2, Fm-3m, Z = 1 per primitive cell"}},
      {"anti_fluorite", {225, 3, "Li2O, Fm-3m, Z = 1 per primitive cell"}},
      {"perovskite", {221, 5, "SrTiO3, Pm-3m, Z = 1"}},
      {"rhenium_trioxide", {221, 4, "ReO3, Pm-3m, Z = 1"}},
      {"double_perovskite", {225, 10, "Ba2MgWO6, Fm-3m, Z = 1 per primitive cell"}},
      {"spinel", {227, 14, "MgAl2O4, Fd-3m, Z = 2 per primitive cell"}},
      {"pyrochlore", {227, 22, "Gd2Ti2O7, Fd-3m, Z = 2 per primitive cell"}},
      {"pyrite", {205, 12, "FeS2, Pa-3, Z = 4"}},
      {"a15", {223, 8, "Cr3Si, Pm-3n, Z = 2"}},
      {"cu3au", {221, 4, "Cu3Au (L1_2), Pm-3m, Z = 1"}},
      {"heusler", {225, 4, "Cu2MnAl (L2_1), Fm-3m, Z = 1 per primitive cell"}},
      {"quaternary_heusler", {216, 4, "LiMgPdSn, F-43m, Z = 1 per primitive cell"}},
      {"fcc_copper", {225, 1, "Cu (A1), Fm-3m"}},
      {"bcc_tungsten", {229, 1, "W (A2), Im-3m"}},
      {"wurtzite", {186, 4, "ZnO, P6_3mc, Z = 2"}},
      {"hcp_magnesium", {194, 2, "Mg (A3), P6_3/mmc"}},
      {"nickel_arsenide", {194, 4, "NiAs, P6_3/mmc, Z = 2"}},
      {"aluminium_diboride", {191, 3, "AlB2, P6/mmm, Z = 1"}},
      {"cacu5", {191, 6, "CaCu5, P6/mmm, Z = 1"}},
      {"cadmium_iodide", {164, 3, "CdI2, P-3m1, Z = 1"}},
      {"corundum", {167, 10, "Al2O3, R-3c, Z = 2 per rhombohedral cell"}},
      {"ilmenite", {148, 10, "FeTiO3, R-3, Z = 2 per rhombohedral cell"}},
      {"layered_rock_salt", {166, 4, "alpha-NaFeO2 (LiCoO2), R-3m, Z = 1 per rhombohedral cell"}},
      {"delafossite", {166, 4, "CuFeO2, R-3m, Z = 1 per rhombohedral cell"}},
      {"rutile", {136, 6, "TiO2, P4_2/mnm, Z = 2"}},
      {"anatase", {141, 6, "TiO2, I4_1/amd, Z = 2 per primitive cell"}},
      {"olivine", {62, 28, "Mg2SiO4, Pnma, Z = 4"}},
      {"orthorhombic_perovskite", {62, 20, "GdFeO3, Pnma, Z = 4"}},
      {"baddeleyite", {14, 12, "ZrO2, P2_1/c, Z = 4"}},
      {"wolframite", {13, 12, "MnWO4, P2/c, Z = 2"}},
  };
  return expected;
}

const std::vector<PreparedType>& Catalogue() {
  static const std::vector<PreparedType> catalogue = PrepareCatalogue();
  return catalogue;
}

structure::Crystal Ideal(const PreparedType& type, const Composition& composition) {
  random::RandomStream unused(1, 0, 0, kDrawDisplacement);
  return AssembleCrystal(type, composition, Strain{}, 0.0, unused);
}

TEST(CorpusTypes, EveryTypeHasItsExpectation) {
  std::set<std::string> names;
  for (const PreparedType& type : Catalogue()) {
    names.insert(type.type->name);
    EXPECT_EQ(ExpectedTypes().count(type.type->name), 1u)
        << type.type->name << " has no expected space group in this test";
  }
  EXPECT_EQ(names.size(), ExpectedTypes().size()) << "an expected type is missing from the corpus";
}

// Each type once per recipe (its first admitted composition), unstrained and undisplaced, at a
// tight tolerance: the International Tables number, each listed Wyckoff site one orbit of spglib
// (no accidental extra symmetry merging two sites), the atom count, neutral in common oxidation
// states (ionic) or not judged (intermetallic), and valid under core's default checks. (spglib
// takes up to 50 ms on a cubic cell here, so not all 3,000 compositions.)
TEST(CorpusTypes, EachTypeHasItsSpaceGroupAtomsAndCharges) {
  for (const PreparedType& type : Catalogue()) {
    const auto expected = ExpectedTypes().find(type.type->name);
    if (expected == ExpectedTypes().end()) continue;  // reported by the test above
    std::set<int> recipes_seen;
    for (const Composition& composition : type.compositions) {
      if (!recipes_seen.insert(composition.recipe).second) continue;
      SCOPED_TRACE(std::string(type.type->name) + " " + composition.formula + " (" +
                   expected->second.source + ")");
      const structure::Crystal crystal = Ideal(type, composition);
      EXPECT_EQ(static_cast<int>(crystal.size()), expected->second.atoms);
      const symmetry::SymmetryInfo info = symmetry::AnalyseSymmetry(crystal, 1e-3);
      EXPECT_EQ(info.number, expected->second.space_group);
      const std::set<int> orbits(info.equivalent_atoms.begin(), info.equivalent_atoms.end());
      EXPECT_EQ(orbits.size(), type.type->sites.size());
      const checks::ValidityResult validity = checks::CheckValidity(crystal);
      EXPECT_TRUE(validity.valid) << (validity.problems.empty() ? "" : validity.problems[0].message);
      const checks::ChargeStatus status = composition.bonding == Bonding::kIonic
                                              ? checks::ChargeStatus::kNeutral
                                              : checks::ChargeStatus::kNotApplicable;
      EXPECT_EQ(validity.charge.status, status) << validity.charge.reason;
      if (::testing::Test::HasFailure()) return;  // one broken type, not thousands of lines
    }
  }
}

// The sizing rule of the corpus (integrations/demo/corpus/README.md): in the unstrained cell the
// tightest cation-anion contact (every contact for intermetallics) is exactly at its radius sum.
// Measured with core's minimum-image distances on the assembled crystal in angstrom.
TEST(CorpusTypes, TightestContactIsAtTheRadiusSum) {
  for (const PreparedType& type : Catalogue()) {
    for (const Composition& composition : type.compositions) {
      SCOPED_TRACE(std::string(type.type->name) + " " + composition.formula);
      const structure::Crystal crystal = Ideal(type, composition);
      const Eigen::MatrixXd distances = structure::DistanceMatrix(crystal);
      const double self = structure::MinimumImage(crystal.lattice).ShortestLatticeVector().distance;
      double tightest = 0;  // largest radius sum / distance
      for (std::size_t i = 0; i < crystal.size(); ++i) {
        for (std::size_t j = i; j < crystal.size(); ++j) {
          const int ri = composition.cell.roles[i], rj = composition.cell.roles[j];
          if (composition.bonding == Bonding::kIonic &&
              (composition.charges[ri] < 0) == (composition.charges[rj] < 0)) {
            continue;
          }
          const double d = i == j ? self : distances(static_cast<Eigen::Index>(i), static_cast<Eigen::Index>(j));
          tightest = std::max(tightest, (composition.radii[ri] + composition.radii[rj]) / d);
        }
      }
      EXPECT_NEAR(tightest, 1.0, 1e-9);
      if (::testing::Test::HasFailure()) return;
    }
  }
}

// Shortest distance (angstrom) between atoms of role `a` and role `b`.
double ShortestBetween(const Composition& composition, const structure::Crystal& crystal, int a, int b) {
  const Eigen::MatrixXd distances = structure::DistanceMatrix(crystal);
  double shortest = 1e300;
  for (std::size_t i = 0; i < crystal.size(); ++i) {
    for (std::size_t j = 0; j < crystal.size(); ++j) {
      if (composition.cell.roles[i] == a && composition.cell.roles[j] == b) {
        shortest = std::min(shortest, distances(static_cast<Eigen::Index>(i), static_cast<Eigen::Index>(j)));
      }
    }
  }
  return shortest;
}

const PreparedType& TypeNamed(const std::string& name) {
  for (const PreparedType& type : Catalogue()) {
    if (name == type.type->name) return type;
  }
  throw std::runtime_error("no type " + name);
}

// Derived free coordinates (geometry, no source): the double perovskite's oxygen and the spinel's
// oxygen sit where the bonds to both cations are stretched alike relative to their radius sums, so
// whichever contact sets the cell (the A-site one when the tolerance factor is above 1), neither
// B-site cation rattles in an oversized octahedron. The spinel's parameter is kept within
// 0.355..0.400; every admitted spinel composition lies inside that range.
TEST(CorpusTypes, DerivedOxygenPositionsStretchBothBondsAlike) {
  // Type, its two cation roles, its anion role.
  const struct { const char* name; int first, second, anion; } cases[] = {
      {"double_perovskite", 1, 2, 3}, {"spinel", 0, 1, 2}};
  for (const auto& c : cases) {
    const PreparedType& type = TypeNamed(c.name);
    for (const Composition& composition : type.compositions) {
      SCOPED_TRACE(std::string(c.name) + " " + composition.formula);
      const structure::Crystal crystal = Ideal(type, composition);
      double stretch[2];
      for (int k = 0; k < 2; ++k) {
        const int cation = k == 0 ? c.first : c.second;
        const double sum = composition.radii[static_cast<std::size_t>(cation)] +
                           composition.radii[static_cast<std::size_t>(c.anion)];
        stretch[k] = ShortestBetween(composition, crystal, cation, c.anion) / sum;
        EXPECT_GE(stretch[k], 1.0 - 1e-9);
      }
      EXPECT_NEAR(stretch[0], stretch[1], 1e-6);
      if (::testing::Test::HasFailure()) return;
    }
  }
}

// The closure check must catch a mistyped generator: the 4-fold axis of Pm-3m given with a stray
// translation closes to more operations than the Tables list.
TEST(CorpusTypes, MistypedGeneratorIsRefused) {
  SpaceGroup wrong{221, "Pm-3m", "", Centring::kP, {"z,x,y", "-y,x+1/2,z", "-x,-y,-z"}, 48};
  try {
    ExpandGroup(wrong);
    FAIL() << "expected an error";
  } catch (const Error& error) {
    EXPECT_EQ(error.kind(), ErrorKind::kInternal);
    EXPECT_NE(std::string(error.what()).find("Pm-3m"), std::string::npos) << error.what();
  }
}

// Wyckoff multiplicities of the International Tables, Vol. A, for positions the corpus uses:
// Fd-3m 32e (x,x,x) and Pnma 8d (general) and 4c (x,1/4,z).
TEST(CorpusTypes, OrbitsHaveTheTablesMultiplicities) {
  EXPECT_EQ(Orbit(ExpandGroup(GroupNumber(227)), {0.26, 0.26, 0.26}).size(), 32u);
  EXPECT_EQ(Orbit(ExpandGroup(GroupNumber(62)), {0.1, 0.2, 0.3}).size(), 8u);
  EXPECT_EQ(Orbit(ExpandGroup(GroupNumber(62)), {0.1, 0.25, 0.3}).size(), 4u);
  EXPECT_EQ(Orbit(ExpandGroup(GroupNumber(225)), {0.25, 0, 0}).size(), 24u);
}

}  // namespace
}  // namespace nucleate::demo::corpus
