// Which held-out compositions an assessment takes: formula order, the first cell as target, Z,
// and the ones a model cannot sample skipped with the reason.
#include "core/assess/composition_targets.h"

#include <gtest/gtest.h>

#include "tests/unit/assess/assess_fixture.h"
#include "tests/unit/bundle/bundle_fixture.h"

namespace nucleate::assess {
namespace {

using testing::CesiumChlorideType;
using testing::RockSalt;

model::Architecture KnowingNaClCsMgO() {
  model::Architecture a;
  a.elements = {8, 11, 12, 17, 55};
  return a;
}

// A 2x1x1 supercell of the rock-salt cell: 4 atoms, Z = 2.
structure::Crystal Doubled(const structure::Crystal& c) {
  structure::Crystal d;
  d.lattice = c.lattice;
  d.lattice.row(0) *= 2;
  for (std::size_t i = 0; i < c.size(); ++i) {
    for (int shift = 0; shift < 2; ++shift) {
      d.numbers.push_back(c.numbers[i]);
      d.frac.push_back(Eigen::Vector3d((c.frac[i][0] + shift) / 2, c.frac[i][1], c.frac[i][2]));
    }
  }
  d.label = c.label + "-doubled";
  return d;
}

std::vector<structure::Crystal> HeldOut() {
  structure::Crystal cscl = CesiumChlorideType(55, 17, 4.12);
  cscl.label = "cscl";
  structure::Crystal nacl = RockSalt(11, 17, 5.64);
  nacl.label = "nacl";
  structure::Crystal mgo = RockSalt(12, 8, 4.21);
  mgo.label = "mgo";
  structure::Crystal kcl = RockSalt(19, 17, 6.29);
  kcl.label = "kcl";
  // Input order differs from formula order; a second NaCl cell (a polymorph stand-in) follows
  // the doubled first one.
  return {cscl, Doubled(nacl), kcl, nacl, mgo};
}

TEST(ChooseCompositions, TakesFormulaOrderAndTheFirstCellOfEachComposition) {
  const CompositionChoice choice = ChooseCompositions(HeldOut(), KnowingNaClCsMgO(), 10, 256);
  EXPECT_EQ(choice.compositions, 4);
  // Byte order of reduced Hill formulas: ClCs < ClK < ClNa < MgO.
  ASSERT_EQ(choice.assessed.size(), 3u);
  EXPECT_EQ(choice.assessed[0].formula, "ClCs");
  EXPECT_EQ(choice.assessed[1].formula, "ClNa");
  EXPECT_EQ(choice.assessed[2].formula, "MgO");
  // ClNa's target is the doubled cell (first in input order): Z = 2, reduced formula Na1 Cl1.
  EXPECT_EQ(choice.assessed[1].target, 1u);
  EXPECT_EQ(choice.assessed[1].formula_units, 2);
  const std::vector<std::pair<int, int>> reduced = {{11, 1}, {17, 1}};
  EXPECT_EQ(choice.assessed[1].reduced, reduced);
  EXPECT_EQ(choice.assessed[0].formula_units, 1);
  // K is not in the vocabulary: skipped, named.
  ASSERT_EQ(choice.skipped.size(), 1u);
  EXPECT_EQ(choice.skipped[0].formula, "ClK");
  EXPECT_EQ(choice.skipped[0].reason, "elements the model does not know: K");
}

TEST(ChooseCompositions, StopsAtTheLimitAndSkipsCellsAboveTheAtomLimit) {
  const CompositionChoice first = ChooseCompositions(HeldOut(), KnowingNaClCsMgO(), 1, 256);
  ASSERT_EQ(first.assessed.size(), 1u);
  EXPECT_EQ(first.assessed[0].formula, "ClCs");
  EXPECT_TRUE(first.skipped.empty());  // KCl comes after the limit was reached
  // With at most 2 atoms per cell the 4-atom NaCl target cannot be sampled.
  const CompositionChoice small = ChooseCompositions(HeldOut(), KnowingNaClCsMgO(), 10, 2);
  ASSERT_EQ(small.assessed.size(), 2u);
  EXPECT_EQ(small.assessed[1].formula, "MgO");
  ASSERT_EQ(small.skipped.size(), 2u);
  EXPECT_EQ(small.skipped[1].formula, "ClNa");
  EXPECT_EQ(small.skipped[1].reason, "4 atoms, above limits.max_atoms (2)");
}

TEST(ChooseCompositions, NamesAHeldOutCellWithABadAtomicNumber) {
  std::vector<structure::Crystal> held_out = HeldOut();
  held_out[2].numbers[0] = 0;
  const Error e =
      model::testing::ErrorFrom([&] { ChooseCompositions(held_out, KnowingNaClCsMgO(), 10, 256); });
  EXPECT_EQ(e.kind(), ErrorKind::kInvalidArgument);
  EXPECT_EQ(e.field().rfind("held_out[2]", 0), 0u) << e.field();
}

}  // namespace
}  // namespace nucleate::assess
