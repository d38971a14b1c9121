#include "core/schedule/sigma_schedule.h"

#include <gtest/gtest.h>

#include <cmath>
#include <functional>
#include <limits>
#include <string>

#include "core/common/error.h"
#include "core/schedule/wrapped_normal.h"

namespace nucleate::schedule {
namespace {

const ScheduleLimits kLimits;

TEST(GeometricSigma, EndpointsAndConstantRatio) {
  // sigma_t = sigma_min (sigma_max / sigma_min)^((t-1)/(T-1)) (definition in sigma_schedule.h;
  // the geometric ladder of Song and Ermon 2019): consecutive ratios are all equal.
  SigmaParams p;
  const auto levels = BuildSigmaSchedule(p, kLimits);
  ASSERT_EQ(levels.size(), 1000u);
  EXPECT_EQ(levels.front().sigma, p.sigma_min);
  EXPECT_EQ(levels.back().sigma, p.sigma_max);
  const double ratio = std::pow(p.sigma_max / p.sigma_min, 1.0 / 999);
  for (size_t i = 1; i < levels.size(); ++i) {
    EXPECT_NEAR(levels[i].sigma / levels[i - 1].sigma, ratio, 1e-12) << i;
    EXPECT_EQ(levels[i].t, static_cast<long long>(i + 1));
  }
}

TEST(KarrasSigma, RootOfSigmaIsLinear) {
  // Karras et al. 2022, eq. 5 (from memory): sigma^(1/rho) interpolates linearly between the ends.
  SigmaParams p;
  p.kind = SigmaKind::kKarras;
  p.steps = 40;
  const auto levels = BuildSigmaSchedule(p, kLimits);
  EXPECT_EQ(levels.front().sigma, p.sigma_min);
  EXPECT_EQ(levels.back().sigma, p.sigma_max);
  const double lo = std::pow(p.sigma_min, 1 / p.rho), hi = std::pow(p.sigma_max, 1 / p.rho);
  for (const auto& level : levels) {
    const double expected = lo + (hi - lo) * (level.t - 1) / (p.steps - 1.0);
    EXPECT_NEAR(std::pow(level.sigma, 1 / p.rho), expected, 1e-14) << level.t;
  }
}

TEST(SigmaSchedule, OneStepIsSigmaMax) {
  SigmaParams p;
  p.steps = 1;
  const auto levels = BuildSigmaSchedule(p, kLimits);
  ASSERT_EQ(levels.size(), 1u);
  EXPECT_EQ(levels[0].sigma, p.sigma_max);
}

TEST(SigmaSchedule, EachLevelCarriesItsDistanceAndBound) {
  SigmaParams p;
  p.steps = 100;
  const auto levels = BuildSigmaSchedule(p, kLimits);
  double previous_tv = 1.0;
  for (const auto& level : levels) {
    EXPECT_EQ(level.tv_distance_to_uniform, WrappedNormalTvDistanceToUniform(level.sigma));
    EXPECT_LT(level.tv_distance_to_uniform, previous_tv);
    previous_tv = level.tv_distance_to_uniform;
    EXPECT_EQ(level.truncation.images, WrappedNormalImagesFor(level.sigma));
    EXPECT_LE(level.truncation.density_relative_error, 1e-16);
    EXPECT_GT(level.truncation.score_absolute_error, 0.0);
  }
  // MODEL-NOTES: at 0.5 the wrapped normal is already close to uniform. Leading Fourier term
  // 2q/pi, q = exp(-2 pi^2 0.25) (see wrapped_normal_test): 4.6e-3.
  EXPECT_NEAR(levels.back().tv_distance_to_uniform, 4.6e-3, 1e-4);
  // At sigma_min = 0.005 almost nothing of the uniform is reached.
  EXPECT_GT(levels.front().tv_distance_to_uniform, 0.95);
}

std::string FieldOf(const SigmaParams& p, ErrorKind expected_kind) {
  try {
    BuildSigmaSchedule(p, kLimits);
  } catch (const Error& e) {
    EXPECT_EQ(static_cast<int>(e.kind()), static_cast<int>(expected_kind)) << e.what();
    return e.field();
  }
  return "no error";
}

TEST(SigmaValidation, EveryErrorNamesItsField) {
  const double nan = std::numeric_limits<double>::quiet_NaN();
  const double inf = std::numeric_limits<double>::infinity();
  const auto bad = [](std::function<void(SigmaParams&)> edit) {
    SigmaParams p;
    edit(p);
    return p;
  };
  const ErrorKind arg = ErrorKind::kInvalidArgument;
  EXPECT_EQ(FieldOf(bad([](auto& p) { p.steps = 0; }), arg), "steps");
  EXPECT_EQ(FieldOf(bad([](auto& p) { p.steps = ScheduleLimits::kDefaultMaxSteps + 1; }),
                    ErrorKind::kLimitExceeded),
            "steps");
  EXPECT_EQ(FieldOf(bad([&](auto& p) { p.sigma_min = nan; }), arg), "sigma_min");
  EXPECT_EQ(FieldOf(bad([&](auto& p) { p.sigma_min = 0.0; }), arg), "sigma_min");
  EXPECT_EQ(FieldOf(bad([&](auto& p) { p.sigma_min = -0.01; }), arg), "sigma_min");
  EXPECT_EQ(FieldOf(bad([&](auto& p) { p.sigma_min = 0.5; }), arg), "sigma_min");
  EXPECT_EQ(FieldOf(bad([&](auto& p) { p.sigma_max = inf; }), arg), "sigma_max");
  EXPECT_EQ(FieldOf(bad([&](auto& p) { p.sigma_max = 1e3; }), arg), "sigma_max");
  EXPECT_EQ(FieldOf(bad([&](auto& p) { p.rho = 0.0; }), arg), "rho");
  EXPECT_EQ(FieldOf(bad([&](auto& p) { p.rho = nan; }), arg), "rho");
  EXPECT_EQ(FieldOf(bad([&](auto& p) { p.kind = static_cast<SigmaKind>(5); }), arg), "kind");
}

}  // namespace
}  // namespace nucleate::schedule
