// Deduplicate and Novelty: groups against the known construction of the input, the
// exhaustive (formula-only) screen, and independence of the thread count.
#include <gtest/gtest.h>

#include "core/common/error.h"
#include "core/match/dedup.h"
#include "core/match/structure_matcher.h"
#include "tests/unit/match/dedup_workload.h"
#include "tests/unit/match/match_support.h"

namespace nucleate::match {
namespace {

using structure::Crystal;
using symmetry::testing::Uniform;

// Input built so the expected groups are known: 6 distinct parents (4 random 8-atom cells of one
// composition, rock salt and CsCl as NaCl), each followed later by rewritten copies (rotation,
// permutation, origin shift, cell choice, 0.02 A noise, 3 % strain).
std::vector<Crystal> Construct(std::vector<int>* parent_of) {
  Uniform u(99);
  std::vector<Crystal> parents;
  for (int k = 0; k < 4; ++k) parents.push_back(testing::RandomCrystal({12, 12, 8, 8, 8, 8, 14, 14}, u, 11.0));
  parents.push_back(testing::Textbook("NaCl rock salt"));
  Crystal cscl = testing::Textbook("CsCl");
  for (int& z : cscl.numbers) z = z == 55 ? 11 : 17;
  parents.push_back(cscl);
  std::vector<Crystal> out;
  parent_of->clear();
  for (std::size_t p = 0; p < parents.size(); ++p) {
    out.push_back(parents[p]);
    parent_of->push_back(static_cast<int>(p));
  }
  Eigen::Matrix3i cell_choice;
  cell_choice << 1, 0, 0, 1, 1, 0, 0, 1, 1;
  for (int round = 0; round < 4; ++round) {
    for (std::size_t p = 0; p < parents.size(); ++p) {
      Crystal c = parents[p];
      switch (round) {
        case 0: c = symmetry::testing::RotateFrame(symmetry::testing::Permute(c, p), testing::RandomRotation(u)); break;
        case 1: c = testing::ChangeBasis(symmetry::testing::Translate(c, {0.1, 0.5, 0.3}), cell_choice); break;
        case 2: c = symmetry::testing::Perturb(c, 0.02, 17 + p); break;
        default: {
          Eigen::Matrix3d e = Eigen::Matrix3d::Zero();
          e(0, 0) = 0.03;
          c = testing::Strain(c, e);
        }
      }
      out.push_back(c);
      parent_of->push_back(static_cast<int>(p));
    }
  }
  return out;
}

TEST(Deduplicate, GroupsEveryCopyWithItsParent) {
  std::vector<int> parent_of;
  const auto structures = Construct(&parent_of);
  const DedupResult r = Deduplicate(structures, MatchTolerances{}, 1);
  ASSERT_EQ(r.groups.size(), 6u);
  for (std::size_t g = 0; g < r.groups.size(); ++g) {
    EXPECT_EQ(r.groups[g].front(), static_cast<int>(g));  // representative = first occurrence
    for (int i : r.groups[g]) EXPECT_EQ(parent_of[i], static_cast<int>(g)) << "structure " << i;
    EXPECT_EQ(r.groups[g].size(), 5u);
  }
  for (std::size_t i = 0; i < structures.size(); ++i) EXPECT_EQ(r.group_of[i], parent_of[i]);
}

// Parents: random cells of one composition; copies perturbed by 0.05 A (same group) or by up to
// 0.65 A (mostly new groups).
std::vector<Crystal> PerturbedSet(std::vector<Crystal>* parents_out) {
  Uniform u(5);
  std::vector<Crystal> parents;
  for (int k = 0; k < 40; ++k) parents.push_back(testing::RandomCrystal({12, 8, 8, 14}, u, 11.0));
  std::vector<Crystal> structures;
  for (int i = 0; i < 700; ++i) {
    const Crystal& p = parents[u.Below(40)];
    structures.push_back(symmetry::testing::Perturb(p, 0.05 + 0.6 * u.Next() * (i % 2), i));
  }
  if (parents_out) *parents_out = parents;
  return structures;
}

TEST(Deduplicate, FingerprintScreenGivesTheExhaustiveResult) {
  std::vector<int> parent_of;
  for (const auto& structures : {Construct(&parent_of), PerturbedSet(nullptr)}) {
    const DedupResult screened = Deduplicate(structures, MatchTolerances{}, 2);
    const DedupResult exhaustive =
        Deduplicate(structures, MatchTolerances{}, 2, DedupScreen::kFormulaOnly);
    EXPECT_EQ(screened.groups, exhaustive.groups);
    EXPECT_LE(screened.pairs_matched, exhaustive.pairs_matched);
  }
}

// The benchmark's workload (dedup_workload.h: near-duplicates, exact duplicates and variants just
// beyond the tolerances, one composition): the screen must not change a single group.
TEST(Deduplicate, ScreenGivesTheExhaustiveGroupsOnTheBenchmarkWorkload) {
  const auto structures = testing::DedupWorkload(3).Make(1500);
  const DedupResult screened = Deduplicate(structures, MatchTolerances{}, 2);
  const DedupResult exhaustive =
      Deduplicate(structures, MatchTolerances{}, 2, DedupScreen::kFormulaOnly);
  EXPECT_EQ(screened.groups, exhaustive.groups);
  // The set exercises both sides: many groups with several members, many singletons.
  int shared = 0;
  for (const auto& g : exhaustive.groups) shared += g.size() > 1;
  EXPECT_GT(shared, 100);
  EXPECT_GT(exhaustive.groups.size(), 700u);
  // And the screen does its job: far fewer pairwise matches.
  EXPECT_LT(screened.pairs_matched * 10, exhaustive.pairs_matched);
}

// The same over many structure types at tolerances narrower than the defaults (each of them feeds
// the lattice screen's box widths and the anchor screen's reach).
TEST(Deduplicate, ScreenGivesTheExhaustiveGroupsAtNarrowTolerances) {
  const auto structures = testing::DedupWorkload(5, testing::Variety::Many()).Make(1500);
  MatchTolerances narrow;
  narrow.length_tolerance = 0.05;
  narrow.site_tolerance = 0.15;
  narrow.angle_tolerance = 2;
  const DedupResult screened = Deduplicate(structures, narrow, 2);
  const DedupResult exhaustive = Deduplicate(structures, narrow, 2, DedupScreen::kFormulaOnly);
  EXPECT_EQ(screened.groups, exhaustive.groups);
  int shared = 0;
  for (const auto& g : exhaustive.groups) shared += g.size() > 1;
  EXPECT_GT(shared, 100);
  EXPECT_LT(screened.pairs_matched * 100, exhaustive.pairs_matched);
}

TEST(Deduplicate, ResultDoesNotDependOnThreadCount) {
  // More structures than one chunk (512) so the chunked parallel path is exercised.
  std::vector<Crystal> parents;
  const std::vector<Crystal> structures = PerturbedSet(&parents);
  const DedupResult one = Deduplicate(structures, MatchTolerances{}, 1);
  const DedupResult four = Deduplicate(structures, MatchTolerances{}, 4);
  EXPECT_EQ(one.groups, four.groups);
  EXPECT_EQ(one.group_of, four.group_of);
  EXPECT_EQ(one.pairs_matched, four.pairs_matched);
  EXPECT_EQ(one.pairs_past_screens, four.pairs_past_screens);
  // Every structure that joined a group got there through one pair that passed the screens.
  EXPECT_GE(one.pairs_past_screens,
            static_cast<std::int64_t>(structures.size() - one.groups.size()));
  EXPECT_LE(one.pairs_past_screens, one.pairs_matched);
  EXPECT_GT(one.groups.size(), 40u);  // the strongly perturbed half founds groups of its own
  EXPECT_LT(one.groups.size(), 700u);

  const std::vector<Crystal> refs(parents.begin(), parents.begin() + 20);
  const NoveltyResult n1 = Novelty(structures, refs, MatchTolerances{}, 1);
  const NoveltyResult n4 = Novelty(structures, refs, MatchTolerances{}, 4);
  EXPECT_EQ(n1.novel, n4.novel);
  EXPECT_EQ(n1.reference, n4.reference);
}

TEST(Novelty, FlagsKnownStructuresAndNamesTheReference) {
  std::vector<int> parent_of;
  const auto structures = Construct(&parent_of);
  // References: parents 1 and 4 (rock salt) only, behind an unrelated structure.
  const std::vector<Crystal> refs = {testing::Textbook("TiO2 rutile"), structures[1], structures[4]};
  const NoveltyResult r = Novelty(structures, refs, MatchTolerances{}, 2);
  for (std::size_t i = 0; i < structures.size(); ++i) {
    const int p = parent_of[i];
    const int expected = p == 1 ? 1 : p == 4 ? 2 : -1;
    EXPECT_EQ(r.reference[i], expected) << "candidate " << i;
    EXPECT_EQ(r.novel[i], expected < 0 ? 1 : 0);
  }
}

TEST(Deduplicate, MalformedStructureIsNamedByIndex) {
  std::vector<Crystal> structures = {testing::Textbook("CsCl"), testing::Textbook("CsCl")};
  structures[1].lattice(0, 0) = std::nan("");
  try {
    Deduplicate(structures, MatchTolerances{}, 4);
    FAIL() << "NaN lattice accepted";
  } catch (const Error& e) {
    EXPECT_EQ(e.field(), "structures[1].lattice[0]");
  }
  EXPECT_THROW(Deduplicate(structures, MatchTolerances{}, -1), Error);
}

}  // namespace
}  // namespace nucleate::match
