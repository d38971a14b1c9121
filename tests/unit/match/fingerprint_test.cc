// Fingerprint invariance (a rewrite of the description changes nothing) and the bin-edge rule.
#include <gtest/gtest.h>

#include "core/match/candidate_index.h"
#include "core/match/fingerprint.h"
#include "core/match/prepared_crystal.h"
#include "tests/unit/match/match_support.h"

namespace nucleate::match {
namespace {

using structure::Crystal;
using symmetry::testing::Uniform;

Fingerprint Of(const Crystal& c, const MatchTolerances& t = {}) {
  return ComputeFingerprint(Prepare(c, t), t);
}

TEST(Fingerprint, InvariantUnderRotationPermutationOriginAndCellChoice) {
  Uniform u(3);
  Eigen::Matrix3i cell_choice;
  cell_choice << 1, 0, 2, 0, 1, 0, 0, -1, 1;
  for (const char* name : {"TiO2 rutile", "ZnO wurtzite", "MgAl2O4 spinel", "triclinic P1 (generic)"}) {
    const Crystal c = testing::Textbook(name);
    const Fingerprint f = Of(c);
    const Crystal r = symmetry::testing::RotateFrame(
        symmetry::testing::Translate(symmetry::testing::Permute(testing::ChangeBasis(c, cell_choice), 2),
                                     {0.4, 0.2, 0.9}),
        testing::RandomRotation(u));
    const Fingerprint g = Of(r);
    EXPECT_EQ(f.key, g.key) << name;
    ASSERT_EQ(f.values.size(), g.values.size());
    for (std::size_t k = 0; k < f.values.size(); ++k) EXPECT_NEAR(f.values[k], g.values[k], 1e-9) << name;
    EXPECT_TRUE(MayMatch(f, g));
  }
}

TEST(Fingerprint, KeyHoldsReducedFormulaAndPrimitiveSiteCount) {
  // Rutile TiO2: reduced formula Ti1 O2 ("8:2 22:1" by ascending Z), 6 sites in the primitive cell.
  EXPECT_EQ(Of(testing::Textbook("TiO2 rutile")).key, "8:2 22:1 / 6");
  MatchTolerances t;
  t.allow_supercell = true;  // the site count drops out of the key when supercells may match
  EXPECT_EQ(Of(testing::Textbook("TiO2 rutile"), t).key, "8:2 22:1");
}

TEST(CandidateIndex, NeighbourCellsCatchPairsAcrossABinEdge) {
  // The fingerprint grid serves supercell matching (the lattice screen does not apply there); the
  // crystals are not consulted on that path. Two fingerprints 0.2 widths apart that straddle a bin edge: different cells, still found.
  Fingerprint a{"k", {0.99, 0.5}, {1.0, 1.0}};
  Fingerprint b{"k", {1.19, 0.5}, {1.0, 1.0}};
  ASSERT_NE(GridCell(a, 2), GridCell(b, 2));
  MatchTolerances t;
  t.allow_supercell = true;
  const PreparedCrystal unused;
  CandidateIndex index(DedupScreen::kFingerprint, t);
  index.Insert(0, &a, unused);
  std::vector<int> found;
  index.Query(b, unused, &found);
  EXPECT_EQ(found, (std::vector<int>{0}));
  // More than one width apart on the screened value: filtered out.
  Fingerprint c{"k", {2.5, 0.5}, {1.0, 1.0}};
  index.Query(c, unused, &found);
  EXPECT_TRUE(found.empty());
  // Another key: never a candidate.
  Fingerprint d{"other", {0.99, 0.5}, {1.0, 1.0}};
  index.Query(d, unused, &found);
  EXPECT_TRUE(found.empty());
}

}  // namespace
}  // namespace nucleate::match
