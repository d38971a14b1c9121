#include "core/train/data/training_statistics.h"

#include <cmath>
#include <string>

#include <gtest/gtest.h>

#include "core/common/error.h"
#include "tests/unit/data/data_test_support.h"

namespace nucleate::train::data {
namespace {

using testing::CubicExample;

// Four training cells and one held-out cell, every statistic worked by hand below.
// Cubic cells with v = 8 or 27 A^3 per atom: edge a = cbrt(N v).
std::vector<TrainingExample> HandExamples() {
  const double nan = std::nan("");
  return {
      CubicExample("a", "Fe", 2.0, {26}, 7, {1.0, 2.0, nan}),                    // N 1, v 8
      CubicExample("b", "LiO", 6.0, {3, 3, 3, 3, 8, 8, 8, 8}, 7, {3.0, 2.0, nan}),  // N 8, v 27
      CubicExample("c", "ClNa", std::cbrt(16.0), {11, 17}, 4, {nan, 2.0, nan}),  // N 2, v 8
      CubicExample("d", "MgO", std::cbrt(54.0), {12, 8}, 0, {5.0, 2.0, nan}),    // N 2, v 27
      CubicExample("held out", "U3", 9.0, {92, 92, 92}, 2, {100.0, 50.0, 7.0}),
  };
}

TEST(TrainingStatistics, MatchesValuesWorkedByHand) {
  const TrainingStatistics s = ComputeTrainingStatistics(HandExamples(), {0, 1, 2, 3});
  EXPECT_EQ(s.cells, 4);
  // Lattice: diagonal features (2/3) ln v = 2 ln 2, 2 ln 3, 2 ln 2, 2 ln 3: mean ln 6, population
  // std ln 1.5; off-diagonal all 0, std floored.
  for (int k = 0; k < 3; ++k) {
    EXPECT_NEAR(s.lattice.mean[k], std::log(6.0), 1e-13);
    EXPECT_NEAR(s.lattice.std[k], std::log(1.5), 1e-13);
  }
  for (int k = 3; k < 6; ++k) EXPECT_EQ(s.lattice.std[k], model::kMinLatticeFeatureStd);
  // Property 0: 1, 3, 5 (one missing): mean 3, population std sqrt(8/3) = 1.6329931618554521.
  // Property 1: always 2: zero spread, std 1. Property 2: no value: mean 0, std 1.
  ASSERT_EQ(s.property_mean.size(), 3u);
  EXPECT_NEAR(s.property_mean[0], 3.0, 1e-15);
  EXPECT_NEAR(s.property_std[0], 1.6329931618554521, 1e-15);
  EXPECT_EQ(s.property_count[0], 3);
  EXPECT_EQ(s.property_mean[1], 2.0);
  EXPECT_EQ(s.property_std[1], 1.0);
  EXPECT_EQ(s.property_count[1], 4);
  EXPECT_EQ(s.property_mean[2], 0.0);
  EXPECT_EQ(s.property_std[2], 1.0);
  EXPECT_EQ(s.property_count[2], 0);
  // Atom counts 1, 8, 2, 2; systems cubic, cubic, tetragonal, none.
  EXPECT_EQ(s.max_atoms, 8);
  EXPECT_EQ(s.atom_counts, (AtomCountHistogram{1, 2, 0, 0, 0, 0, 0, 1}));
  EXPECT_EQ(s.atom_counts_by_crystal_system[7], (AtomCountHistogram{1, 0, 0, 0, 0, 0, 0, 1}));
  EXPECT_EQ(s.atom_counts_by_crystal_system[4], (AtomCountHistogram{0, 1, 0, 0, 0, 0, 0, 0}));
  EXPECT_EQ(s.atom_counts_by_crystal_system[0], (AtomCountHistogram{0, 1, 0, 0, 0, 0, 0, 0}));
  for (int system : {1, 2, 3, 5, 6}) {
    EXPECT_EQ(s.atom_counts_by_crystal_system[system], AtomCountHistogram(8, 0)) << system;
  }
  // Elements of the training cells only (uranium is held out).
  EXPECT_EQ(s.elements, (std::vector<int>{3, 8, 11, 12, 17, 26}));
}

TEST(TrainingStatistics, RefusesAnEmptyOrOutOfRangeSplit) {
  const auto field = [](const std::vector<std::size_t>& train) {
    try {
      ComputeTrainingStatistics(HandExamples(), train);
    } catch (const Error& e) {
      return e.field();
    }
    return std::string("(no error)");
  };
  EXPECT_EQ(field({}), "train");
  EXPECT_EQ(field({0, 5}), "train[1]");
  EXPECT_EQ(field({4}), "(no error)");
}

}  // namespace
}  // namespace nucleate::train::data
