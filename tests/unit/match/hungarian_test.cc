// The assignment solver against exhaustive enumeration of all n! assignments (the definition of
// the minimum, no outside source needed).
#include <algorithm>
#include <limits>
#include <numeric>
#include <vector>

#include <gtest/gtest.h>

#include "core/match/hungarian.h"
#include "tests/unit/symmetry/structure_transforms.h"

namespace nucleate::match {
namespace {

double BruteForce(const std::vector<double>& cost, int n) {
  std::vector<int> p(n);
  std::iota(p.begin(), p.end(), 0);
  double best = std::numeric_limits<double>::infinity();
  do {
    double s = 0;
    for (int i = 0; i < n; ++i) s += cost[i * n + p[i]];
    best = std::min(best, s);
  } while (std::next_permutation(p.begin(), p.end()));
  return best;
}

TEST(Hungarian, MatchesExhaustiveMinimumOnRandomMatrices) {
  symmetry::testing::Uniform u(7);
  AssignmentWorkspace w;
  for (int trial = 0; trial < 300; ++trial) {
    const int n = 1 + trial % 8;
    std::vector<double> cost(n * n);
    // Every third matrix has many equal entries: ties are where such solvers go wrong.
    for (auto& c : cost) c = trial % 3 == 0 ? static_cast<double>(u.Below(3)) : u.Next() * 10;
    std::vector<int> assignment;
    const double total = SolveAssignment(cost.data(), n, &assignment, &w);
    EXPECT_NEAR(total, BruteForce(cost, n), 1e-9) << "trial " << trial;
    std::vector<int> sorted = assignment;
    std::sort(sorted.begin(), sorted.end());
    for (int i = 0; i < n; ++i) EXPECT_EQ(sorted[i], i) << "not a permutation, trial " << trial;
    double recomputed = 0;
    for (int i = 0; i < n; ++i) recomputed += cost[i * n + assignment[i]];
    EXPECT_NEAR(recomputed, total, 1e-9);
  }
}

TEST(Hungarian, PicksTheAntiDiagonalWhenItIsCheapest) {
  // Hand-checked: rows prefer the opposite column, the identity costs 2 + 2, the swap 0 + 0.
  const double cost[] = {2, 0, 0, 2};
  std::vector<int> assignment;
  AssignmentWorkspace w;
  EXPECT_DOUBLE_EQ(SolveAssignment(cost, 2, &assignment, &w), 0.0);
  EXPECT_EQ(assignment, (std::vector<int>{1, 0}));
}

}  // namespace
}  // namespace nucleate::match
