// Wasserstein1 against cases computed by hand from the definition, W1 = integral of |F - G| dx
// over the empirical cumulative distribution functions F and G (the standard definition on the
// real line); tests/reference/assess compares it with scipy.stats.wasserstein_distance.
#include "core/assess/wasserstein.h"

#include <gtest/gtest.h>

#include <cmath>
#include <limits>
#include <vector>

#include "tests/unit/bundle/bundle_fixture.h"

namespace nucleate::assess {
namespace {

using model::testing::ErrorFrom;

TEST(Wasserstein1, IdenticalSamplesAreAtDistanceZero) {
  EXPECT_EQ(Wasserstein1({2.5, 1.0, 4.0}, {4.0, 2.5, 1.0}), 0.0);
  // Hand: F = G = 1 from x = 1 on, whatever the multiplicity.
  EXPECT_EQ(Wasserstein1({1, 1, 1}, {1}), 0.0);
}

TEST(Wasserstein1, TwoPointMassesAreTheirSeparationApart) {
  // Hand: |F - G| = 1 on [0, 3).
  EXPECT_DOUBLE_EQ(Wasserstein1({0}, {3}), 3.0);
}

TEST(Wasserstein1, AShiftedSampleIsTheShiftAway) {
  // Hand: |F - G| is 1/3 on [1, 2), 2/3 on [2, 3), 1/3 on [3, 4) and 1/3 on [4, 6):
  // 1/3 + 2/3 + 1/3 + 2/3 = 2, the shift (each value moves by 2).
  EXPECT_DOUBLE_EQ(Wasserstein1({1, 2, 4}, {3, 4, 6}), 2.0);
}

TEST(Wasserstein1, SamplesOfDifferentSizes) {
  // Hand: a = {0, 2, 4}, b = {1, 3}. On [0,1) F = 1/3, G = 0; [1,2) 1/3 vs 1/2; [2,3) 2/3 vs 1/2;
  // [3,4) 2/3 vs 1: 1/3 + 1/6 + 1/6 + 1/3 = 1.
  EXPECT_DOUBLE_EQ(Wasserstein1({0, 2, 4}, {1, 3}), 1.0);
  // Hand: {0, 1} against {0}: F = 1/2, G = 1 on [0, 1): 1/2.
  EXPECT_DOUBLE_EQ(Wasserstein1({0, 1}, {0}), 0.5);
  // Element counts per cell, the integer-valued use: {1, 2, 2, 3} against {2, 2, 2, 2}: on
  // [1, 2) F = 1/4, G = 0; on [2, 3) F = 3/4, G = 1: 1/4 + 1/4 = 1/2.
  EXPECT_DOUBLE_EQ(Wasserstein1({1, 2, 2, 3}, {2, 2, 2, 2}), 0.5);
}

TEST(Wasserstein1, IsSymmetricAndIgnoresOrder) {
  const std::vector<double> a = {3.1, -0.4, 7.25, 2.0, 2.0};
  const std::vector<double> b = {5.5, 1.0, -2.0};
  EXPECT_EQ(Wasserstein1(a, b), Wasserstein1(b, a));
  EXPECT_EQ(Wasserstein1(a, b), Wasserstein1({2.0, 7.25, -0.4, 2.0, 3.1}, {-2.0, 5.5, 1.0}));
}

TEST(Wasserstein1, RefusesEmptyAndNonFiniteSamplesNamingThem) {
  Error e = ErrorFrom([] { Wasserstein1({}, {1.0}); });
  EXPECT_EQ(e.kind(), ErrorKind::kInvalidArgument);
  EXPECT_EQ(e.field(), "a");
  e = ErrorFrom([] { Wasserstein1({1.0}, {2.0, std::numeric_limits<double>::quiet_NaN()}); });
  EXPECT_EQ(e.field(), "b");
  EXPECT_NE(std::string(e.what()).find("value 1"), std::string::npos) << e.what();
  e = ErrorFrom([] { Wasserstein1({std::numeric_limits<double>::infinity()}, {2.0}); });
  EXPECT_EQ(e.field(), "a");
}

}  // namespace
}  // namespace nucleate::assess
