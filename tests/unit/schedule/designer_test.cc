#include "core/schedule/designer.h"

#include <gtest/gtest.h>

#include <cmath>
#include <functional>
#include <limits>
#include <string>

#include "core/common/error.h"
#include "core/schedule/wrapped_normal.h"

namespace nucleate::schedule {
namespace {

constexpr double kPi = 3.14159265358979323846;
const ScheduleLimits kLimits;

double RelDiff(double a, double b) {
  return std::fabs(a - b) / std::max(std::fabs(b), 1e-300);
}

TEST(Designer, MeetsTheTerminalSnrForEveryKind) {
  for (VarianceKind kind : {VarianceKind::kLinear, VarianceKind::kCosine, VarianceKind::kSigmoid,
                            VarianceKind::kLogSnrLinear}) {
    for (double terminal : {1e-4, 1e-2, 3e-6}) {
      for (long long steps : {1000LL, 100LL}) {
        DesignTargets targets;
        targets.variance_kind = kind;
        targets.terminal_snr = terminal;
        targets.steps = steps;
        const Design d = DesignSchedules(targets, kLimits);
        // Rebuild the table from the returned parameters: the design must hold as handed out.
        const auto table = BuildVarianceSchedule(d.variance, kLimits);
        ASSERT_EQ(table.size(), static_cast<size_t>(steps));
        EXPECT_LT(RelDiff(table.back().snr, terminal), 1e-6)
            << static_cast<int>(kind) << " " << terminal << " " << steps;
        EXPECT_EQ(d.diagnostics.achieved_terminal_snr, table.back().snr);
        EXPECT_EQ(d.diagnostics.achieved_initial_snr, table.front().snr);
        if (kind == VarianceKind::kLinear || kind == VarianceKind::kLogSnrLinear) {
          EXPECT_LT(RelDiff(table.front().snr, targets.initial_snr), 1e-6)
              << static_cast<int>(kind);
        }
        double max_step = 0;
        for (size_t i = 1; i < table.size(); ++i) {
          max_step = std::max(max_step, std::fabs(table[i].log_snr - table[i - 1].log_snr));
        }
        EXPECT_EQ(d.diagnostics.max_log_snr_step, max_step);
      }
    }
  }
}

TEST(Designer, LogSnrLinearStepsAreEven) {
  // A log-SNR that is linear in t has every step equal to (log init - log terminal)/(T - 1).
  DesignTargets targets;
  targets.variance_kind = VarianceKind::kLogSnrLinear;
  const Design d = DesignSchedules(targets, kLimits);
  EXPECT_NEAR(d.diagnostics.max_log_snr_step, (std::log(1e4) - std::log(1e-4)) / 999, 1e-12);
}

TEST(Designer, SigmaMaxIsTheSmallestMeetingTheDistance) {
  for (double tv : {0.005, 0.05, 1e-6}) {
    DesignTargets targets;
    targets.tv_distance = tv;
    const Design d = DesignSchedules(targets, kLimits);
    const double at = WrappedNormalTvDistanceToUniform(d.sigma.sigma_max);
    EXPECT_LE(at, tv);
    EXPECT_GT(WrappedNormalTvDistanceToUniform(0.999 * d.sigma.sigma_max), tv);
    EXPECT_EQ(d.diagnostics.tv_distance_at_sigma_max, at);
    // Leading Fourier term TV ~ 2q/pi, q = exp(-2 pi^2 sigma^2) (see wrapped_normal_test), solved
    // for sigma: a rough independent estimate of where the answer must lie.
    const double estimate = std::sqrt(-std::log(tv * kPi / 2) / (2 * kPi * kPi));
    EXPECT_NEAR(d.sigma.sigma_max / estimate, 1.0, 0.05) << tv;
  }
}

TEST(Designer, FinestDisplacementIsTheResolution) {
  DesignTargets targets;
  targets.resolution_angstrom = 0.03;
  targets.cell_length_angstrom = 7.5;
  targets.sigma_kind = SigmaKind::kKarras;
  const Design d = DesignSchedules(targets, kLimits);
  EXPECT_DOUBLE_EQ(d.diagnostics.finest_displacement_angstrom, 0.03);
  EXPECT_DOUBLE_EQ(d.sigma.sigma_min, 0.004);
  EXPECT_DOUBLE_EQ(d.diagnostics.coarsest_displacement_angstrom, d.sigma.sigma_max * 7.5);
  EXPECT_EQ(d.sigma.kind, SigmaKind::kKarras);
  EXPECT_EQ(d.sigma.steps, targets.steps);
  // The sigma design is a valid schedule request as handed out.
  EXPECT_EQ(BuildSigmaSchedule(d.sigma, kLimits).back().sigma, d.sigma.sigma_max);
}

std::string FieldOf(std::function<void(DesignTargets&)> edit, ErrorKind expected_kind) {
  DesignTargets targets;
  edit(targets);
  try {
    DesignSchedules(targets, kLimits);
  } catch (const Error& e) {
    EXPECT_EQ(static_cast<int>(e.kind()), static_cast<int>(expected_kind)) << e.what();
    return e.field();
  }
  return "no error";
}

TEST(DesignerValidation, EveryErrorNamesItsField) {
  const double nan = std::numeric_limits<double>::quiet_NaN();
  const ErrorKind arg = ErrorKind::kInvalidArgument;
  EXPECT_EQ(FieldOf([](auto& t) { t.steps = 1; }, arg), "steps");
  EXPECT_EQ(FieldOf([](auto& t) { t.steps = 100001; }, ErrorKind::kLimitExceeded), "steps");
  EXPECT_EQ(FieldOf([](auto& t) { t.terminal_snr = 0; }, arg), "terminal_snr");
  EXPECT_EQ(FieldOf([&](auto& t) { t.terminal_snr = nan; }, arg), "terminal_snr");
  EXPECT_EQ(FieldOf([](auto& t) { t.initial_snr = 1e-5; }, arg), "initial_snr");
  EXPECT_EQ(FieldOf([](auto& t) { t.tv_distance = 0; }, arg), "tv_distance");
  EXPECT_EQ(FieldOf([](auto& t) { t.tv_distance = 1; }, arg), "tv_distance");
  EXPECT_EQ(FieldOf([](auto& t) { t.resolution_angstrom = -0.02; }, arg), "resolution_angstrom");
  EXPECT_EQ(FieldOf([&](auto& t) { t.cell_length_angstrom = nan; }, arg), "cell_length_angstrom");
  EXPECT_EQ(FieldOf([](auto& t) { t.variance_kind = static_cast<VarianceKind>(7); }, arg),
            "variance_kind");
  EXPECT_EQ(FieldOf([](auto& t) { t.sigma_kind = static_cast<SigmaKind>(7); }, arg), "sigma_kind");
  // 1000 steps at a constant beta = 1/(1 + 1e4) already end at SNR 9.5 < 10: a linear schedule
  // cannot stop higher.
  EXPECT_EQ(FieldOf(
                [](auto& t) {
                  t.variance_kind = VarianceKind::kLinear;
                  t.terminal_snr = 10;
                },
                arg),
            "terminal_snr");
  // sigma_min = 2.5 / 5 = 0.5 is already within 0.005 of uniform (TV 4.6e-3).
  EXPECT_EQ(FieldOf([](auto& t) { t.resolution_angstrom = 2.5; }, arg), "tv_distance");
}

}  // namespace
}  // namespace nucleate::schedule
