#include "core/schedule/variance_schedule.h"

#include <gtest/gtest.h>

#include <cmath>
#include <functional>
#include <limits>
#include <string>

#include "core/common/error.h"

namespace nucleate::schedule {
namespace {

constexpr double kPi = 3.14159265358979323846;
const ScheduleLimits kLimits;

VarianceParams Params(VarianceKind kind, long long steps = 1000) {
  VarianceParams p;
  p.kind = kind;
  p.steps = steps;
  return p;
}

// Relative difference, with an absolute floor for values at or near 0.
double RelDiff(double a, double b) {
  return std::fabs(a - b) / std::max({std::fabs(a), std::fabs(b), 1e-300});
}

TEST(LinearSchedule, EndpointsAreTheDefaults) {
  // Ho et al. 2020, sec. 4: betas rise linearly from beta_1 = 1e-4 to beta_T = 0.02, T = 1000.
  const auto rows = BuildVarianceSchedule(Params(VarianceKind::kLinear), kLimits);
  ASSERT_EQ(rows.size(), 1000u);
  EXPECT_EQ(rows.front().beta, 1e-4);
  EXPECT_DOUBLE_EQ(rows.back().beta, 0.02);
  // The difference of two ~1e-2 values carries ~1e-16 / 2e-5 relative rounding.
  EXPECT_NEAR(rows[499].beta - rows[498].beta, (0.02 - 1e-4) / 999, 1e-12 * 2e-5);
}

TEST(LinearSchedule, AlphaBarIsTheProductOfOneMinusBeta) {
  // Ho et al. 2020, sec. 2: alpha_bar_t = prod_{s<=t} (1 - beta_s), recomputed here in long
  // double from the closed-form betas.
  const auto rows = BuildVarianceSchedule(Params(VarianceKind::kLinear), kLimits);
  long double product = 1;
  for (const auto& r : rows) {
    const long double beta = 1e-4L + (0.02L - 1e-4L) * (r.t - 1) / 999.0L;
    product *= 1 - beta;
    EXPECT_LT(RelDiff(r.alpha_bar, static_cast<double>(product)), 1e-12) << r.t;
    EXPECT_EQ(r.source_t, r.t);
  }
}

TEST(LinearSchedule, OneStep) {
  VarianceParams p = Params(VarianceKind::kLinear, 1);
  const auto rows = BuildVarianceSchedule(p, kLimits);
  ASSERT_EQ(rows.size(), 1u);
  EXPECT_EQ(rows[0].beta, p.beta_start);
  EXPECT_EQ(rows[0].posterior_variance, 0.0);
  EXPECT_EQ(rows[0].posterior_log_variance_clipped, std::log(p.beta_start));
}

TEST(CosineSchedule, AlphaBarIsRatioOfCosinesWhereUnclipped) {
  // Nichol and Dhariwal 2021, eq. 17: alpha_bar_t = f(t)/f(0), f(t) = cos^2(((t/T)+s)/(1+s) pi/2),
  // evaluated here in long double.
  VarianceParams p = Params(VarianceKind::kCosine);
  const auto rows = BuildVarianceSchedule(p, kLimits);
  auto f = [&](long double t) {
    const long double c = std::cos((t / p.steps + p.cosine_offset) / (1 + p.cosine_offset) *
                                   static_cast<long double>(kPi) / 2);
    return c * c;
  };
  int unclipped = 0;
  for (const auto& r : rows) {
    if (r.beta >= p.max_beta) break;  // the clip changes every later alpha_bar
    ++unclipped;
    EXPECT_LT(RelDiff(r.alpha_bar, static_cast<double>(f(r.t) / f(0))), 1e-12) << r.t;
  }
  // With the defaults only the last step reaches the clip (beta_T -> 1 as f(T) -> 0).
  EXPECT_EQ(unclipped, 999);
  EXPECT_EQ(rows.back().beta, p.max_beta);
  EXPECT_LT(RelDiff(rows.back().alpha_bar, rows[998].alpha_bar * (1 - p.max_beta)), 1e-15);
}

TEST(SigmoidSchedule, AlphaBarFollowsChen2023WhereUnclipped) {
  // Chen 2023, "On the importance of noise scheduling for diffusion models", the sigmoid
  // schedule: alpha_bar(u) = (v_end - sigmoid((u (end - start) + start)/tau)) / (v_end - v_start).
  // The direct formula loses relative accuracy as alpha_bar -> 0, so compare where it is > 1e-3.
  for (double tau : {1.0, 0.5, 2.0}) {
    VarianceParams p = Params(VarianceKind::kSigmoid);
    p.sigmoid_tau = tau;
    const auto rows = BuildVarianceSchedule(p, kLimits);
    auto sig = [](long double x) { return 1 / (1 + std::exp(-x)); };
    const long double v_start = sig(p.sigmoid_start / tau), v_end = sig(p.sigmoid_end / tau);
    for (const auto& r : rows) {
      if (r.t == p.steps) break;
      const long double u = static_cast<long double>(r.t) / p.steps;
      const long double ab =
          (v_end - sig((u * (p.sigmoid_end - p.sigmoid_start) + p.sigmoid_start) / tau)) /
          (v_end - v_start);
      if (ab > 1e-3L) {
        EXPECT_LT(RelDiff(r.alpha_bar, static_cast<double>(ab)), 1e-12) << r.t;
      }
      EXPECT_LT(r.beta, p.max_beta);
    }
    // Unclipped, beta_T would be 1 (alpha_bar(1) = 0): the clip holds it at max_beta.
    EXPECT_EQ(rows.back().beta, p.max_beta);
  }
}

TEST(LogSnrLinearSchedule, LogSnrIsLinearBetweenTheEndpoints) {
  // Definition in variance_schedule.h: lambda(u) = lambda_max + (lambda_min - lambda_max) u.
  VarianceParams p = Params(VarianceKind::kLogSnrLinear, 200);
  const auto rows = BuildVarianceSchedule(p, kLimits);
  for (const auto& r : rows) {
    const double expected = p.log_snr_max + (p.log_snr_min - p.log_snr_max) * r.t / p.steps;
    EXPECT_NEAR(r.log_snr, expected, 1e-12 * std::max(1.0, std::fabs(expected))) << r.t;
  }
  EXPECT_NEAR(rows.back().log_snr, p.log_snr_min, 1e-12 * std::fabs(p.log_snr_min));
  // alpha_bar_0 = 1, so beta_1 = 1 - alpha_bar_1 = 1 - sigmoid(lambda_1).
  EXPECT_LT(RelDiff(rows[0].beta, 1 - rows[0].alpha_bar), 1e-12);
}

TEST(LogSnrShift, MovesEveryLogSnrByTheShift) {
  // Hoogeboom et al. 2023, simple diffusion: log-SNR shifted by a constant (there 2 log(64/d)).
  for (VarianceKind kind : {VarianceKind::kLinear, VarianceKind::kCosine, VarianceKind::kSigmoid,
                            VarianceKind::kLogSnrLinear}) {
    for (double shift : {-2.0, 1.5}) {
      VarianceParams p = Params(kind, 500);
      const auto base = BuildVarianceSchedule(p, kLimits);
      p.log_snr_shift = shift;
      const auto shifted = BuildVarianceSchedule(p, kLimits);
      for (size_t i = 0; i < base.size(); ++i) {
        EXPECT_NEAR(shifted[i].log_snr - base[i].log_snr, shift,
                    1e-12 * std::max(1.0, std::fabs(base[i].log_snr)))
            << i;
        // The betas are recomputed from the new alpha_bar (alpha_bar_0 = 1 still).
        const double prev = i == 0 ? 1.0 : shifted[i - 1].alpha_bar;
        EXPECT_LT(RelDiff(shifted[i].alpha_bar, prev * (1 - shifted[i].beta)), 1e-12) << i;
      }
    }
  }
}

TEST(ZeroTerminalSnr, RescalesSqrtAlphaBarAsLin2024) {
  // Lin et al. 2024, "Common diffusion noise schedules and sample steps are flawed", Algorithm 1:
  // sqrt_ab <- (sqrt_ab - sqrt_ab_T) * sqrt_ab_1 / (sqrt_ab_1 - sqrt_ab_T).
  for (VarianceKind kind : {VarianceKind::kLinear, VarianceKind::kCosine}) {
    VarianceParams p = Params(kind);
    const auto base = BuildVarianceSchedule(p, kLimits);
    p.zero_terminal_snr = true;
    const auto rows = BuildVarianceSchedule(p, kLimits);
    const double a1 = base.front().sqrt_alpha_bar, aT = base.back().sqrt_alpha_bar;
    EXPECT_EQ(rows.front().alpha_bar, base.front().alpha_bar);
    EXPECT_EQ(rows.back().alpha_bar, 0.0);
    EXPECT_EQ(rows.back().snr, 0.0);
    EXPECT_EQ(rows.back().log_snr, -std::numeric_limits<double>::infinity());
    EXPECT_EQ(rows.back().beta, 1.0);
    EXPECT_TRUE(std::isfinite(rows.back().posterior_variance));
    EXPECT_TRUE(std::isfinite(rows.back().posterior_log_variance_clipped));
    for (size_t i = 1; i + 1 < rows.size(); ++i) {
      const double expected = (base[i].sqrt_alpha_bar - aT) * a1 / (a1 - aT);
      EXPECT_LT(RelDiff(rows[i].sqrt_alpha_bar, expected), 1e-12) << i;
    }
  }
}

TEST(Respacing, KeepsAlphaBarAtTheKeptSteps) {
  // Nichol and Dhariwal 2021, sec. 4 ("respacing"): alpha_bar at the kept steps is unchanged and
  // beta_i = 1 - alpha_bar(source_i) / alpha_bar(source_{i-1}).
  for (VarianceKind kind : {VarianceKind::kLinear, VarianceKind::kCosine}) {
    VarianceParams p = Params(kind);
    const auto full = BuildVarianceSchedule(p, kLimits);
    for (long long n : {1LL, 3LL, 50LL, 999LL}) {
      p.respaced_steps = n;
      const auto rows = BuildVarianceSchedule(p, kLimits);
      ASSERT_EQ(rows.size(), static_cast<size_t>(n));
      EXPECT_EQ(rows.back().source_t, 1000);
      long long previous_source = 0;
      for (const auto& r : rows) {
        // round(i T / n), rounding halves up: integer arithmetic in the test, double in the core.
        EXPECT_EQ(r.source_t, static_cast<long long>(std::floor(r.t * 1000.0 / n + 0.5)));
        EXPECT_GT(r.source_t, previous_source);
        EXPECT_EQ(r.alpha_bar, full[r.source_t - 1].alpha_bar);
        const double prev_ab = previous_source == 0 ? 1.0 : full[previous_source - 1].alpha_bar;
        EXPECT_LT(RelDiff(r.beta, 1 - r.alpha_bar / prev_ab), 1e-9) << r.t;
        previous_source = r.source_t;
      }
    }
    p.respaced_steps = 3;
    const auto three = BuildVarianceSchedule(p, kLimits);
    EXPECT_EQ(three[0].source_t, 333);
    EXPECT_EQ(three[1].source_t, 667);
    // Keeping all steps is the identity, bit for bit.
    p.respaced_steps = 1000;
    const auto all = BuildVarianceSchedule(p, kLimits);
    for (size_t i = 0; i < all.size(); ++i) EXPECT_EQ(all[i].beta, full[i].beta);
  }
}

// q(x_{t-1} | x_t, x_0) by Bayes' theorem for Gaussians (Bishop 2006, PRML eqs. 2.113-2.117):
// prior x_{t-1} ~ N(sqrt(ab_{t-1}) x0, 1 - ab_{t-1}), likelihood x_t ~ N(sqrt(alpha_t) x_{t-1},
// beta_t); the posterior precision is the sum of precisions and the mean the precision-weighted
// combination. Computed here without the closed forms of Ho et al. eq. 7.
TEST(Posterior, MatchesProductOfGaussians) {
  for (VarianceKind kind : {VarianceKind::kLinear, VarianceKind::kCosine, VarianceKind::kSigmoid,
                            VarianceKind::kLogSnrLinear}) {
    const auto rows = BuildVarianceSchedule(Params(kind), kLimits);
    for (size_t i = 1; i < rows.size(); i += 37) {
      const long double ab_prev = rows[i - 1].alpha_bar, beta = rows[i].beta;
      const long double alpha = 1 - beta;
      const long double prior_var = 1 - ab_prev;
      const long double precision = 1 / prior_var + alpha / beta;
      const long double variance = 1 / precision;
      for (double x0 : {-1.3, 0.0, 2.0}) {
        for (double xt : {-0.7, 0.4}) {
          const long double mean =
              variance * (std::sqrt(ab_prev) * x0 / prior_var + std::sqrt(alpha) * xt / beta);
          const double got =
              rows[i].posterior_mean_coef_x0 * x0 + rows[i].posterior_mean_coef_xt * xt;
          EXPECT_NEAR(got, static_cast<double>(mean),
                      1e-11 * (1 + std::fabs(static_cast<double>(mean))))
              << "t " << rows[i].t;
        }
      }
      EXPECT_LT(RelDiff(rows[i].posterior_variance, static_cast<double>(variance)), 1e-11)
          << rows[i].t;
      EXPECT_LT(
          RelDiff(rows[i].posterior_log_variance_clipped, std::log(rows[i].posterior_variance)),
          1e-15);
    }
    // t = 1: alpha_bar_0 = 1, the prior is a point mass at x0.
    EXPECT_EQ(rows[0].posterior_variance, 0.0);
    EXPECT_NEAR(rows[0].posterior_mean_coef_x0, 1.0, 1e-15);
    EXPECT_EQ(rows[0].posterior_mean_coef_xt, 0.0);
    EXPECT_EQ(rows[0].posterior_log_variance_clipped, rows[1].posterior_log_variance_clipped);
  }
}

TEST(StepColumns, AgreeWithTheirDefinitions) {
  for (VarianceKind kind : {VarianceKind::kLinear, VarianceKind::kCosine, VarianceKind::kSigmoid,
                            VarianceKind::kLogSnrLinear}) {
    const auto rows = BuildVarianceSchedule(Params(kind), kLimits);
    for (const auto& r : rows) {
      const long double ab = r.alpha_bar;
      EXPECT_LT(RelDiff(r.alpha, 1 - r.beta), 1e-15);
      EXPECT_LT(RelDiff(r.sqrt_alpha_bar, static_cast<double>(std::sqrt(ab))), 1e-15);
      EXPECT_LT(RelDiff(r.sqrt_one_minus_alpha_bar, static_cast<double>(std::sqrt(1 - ab))), 1e-11);
      EXPECT_LT(RelDiff(r.snr, static_cast<double>(ab / (1 - ab))), 1e-11);
      EXPECT_NEAR(r.log_snr, std::log(r.snr), 1e-12 * std::max(1.0, std::fabs(r.log_snr)));
    }
  }
}

std::string FieldOf(const VarianceParams& p, ErrorKind expected_kind,
                    const ScheduleLimits& limits = kLimits) {
  try {
    BuildVarianceSchedule(p, limits);
  } catch (const Error& e) {
    EXPECT_EQ(static_cast<int>(e.kind()), static_cast<int>(expected_kind)) << e.what();
    return e.field();
  }
  return "no error";
}

TEST(VarianceValidation, EveryErrorNamesItsField) {
  const double nan = std::numeric_limits<double>::quiet_NaN();
  const double inf = std::numeric_limits<double>::infinity();
  const auto bad = [](std::function<void(VarianceParams&)> edit) {
    VarianceParams p;
    edit(p);
    return p;
  };
  const ErrorKind arg = ErrorKind::kInvalidArgument, limit = ErrorKind::kLimitExceeded;
  EXPECT_EQ(FieldOf(bad([](auto& p) { p.steps = 0; }), arg), "steps");
  EXPECT_EQ(FieldOf(bad([](auto& p) { p.steps = -5; }), arg), "steps");
  EXPECT_EQ(FieldOf(bad([](auto& p) { p.steps = ScheduleLimits::kDefaultMaxSteps + 1; }), limit),
            "steps");
  EXPECT_EQ(FieldOf(bad([&](auto& p) { p.beta_start = nan; }), arg), "beta_start");
  EXPECT_EQ(FieldOf(bad([&](auto& p) { p.beta_start = -1e-4; }), arg), "beta_start");
  EXPECT_EQ(FieldOf(bad([&](auto& p) { p.beta_end = inf; }), arg), "beta_end");
  EXPECT_EQ(FieldOf(bad([&](auto& p) { p.beta_end = 1.0; }), arg), "beta_end");
  EXPECT_EQ(FieldOf(bad([&](auto& p) { p.beta_start = 0.03; }), arg), "beta_start");
  EXPECT_EQ(FieldOf(bad([&](auto& p) { p.cosine_offset = -0.1; }), arg), "cosine_offset");
  EXPECT_EQ(FieldOf(bad([&](auto& p) { p.cosine_offset = nan; }), arg), "cosine_offset");
  EXPECT_EQ(FieldOf(bad([&](auto& p) { p.max_beta = 0.0; }), arg), "max_beta");
  EXPECT_EQ(FieldOf(bad([&](auto& p) { p.max_beta = 1.5; }), arg), "max_beta");
  EXPECT_EQ(FieldOf(bad([&](auto& p) { p.sigmoid_start = 4.0; }), arg), "sigmoid_start");
  EXPECT_EQ(FieldOf(bad([&](auto& p) { p.sigmoid_end = -inf; }), arg), "sigmoid_end");
  EXPECT_EQ(FieldOf(bad([&](auto& p) { p.sigmoid_tau = 0.0; }), arg), "sigmoid_tau");
  EXPECT_EQ(FieldOf(bad([&](auto& p) { p.log_snr_min = 10.0; }), arg), "log_snr_min");
  EXPECT_EQ(FieldOf(bad([&](auto& p) { p.log_snr_max = nan; }), arg), "log_snr_max");
  EXPECT_EQ(FieldOf(bad([&](auto& p) { p.log_snr_shift = inf; }), arg), "log_snr_shift");
  EXPECT_EQ(FieldOf(bad([&](auto& p) { p.respaced_steps = 1001; }), arg), "respaced_steps");
  EXPECT_EQ(FieldOf(bad([&](auto& p) { p.respaced_steps = -1; }), arg), "respaced_steps");
  EXPECT_EQ(FieldOf(bad([&](auto& p) {
                      p.steps = 1;
                      p.zero_terminal_snr = true;
                    }),
                    arg),
            "zero_terminal_snr");
  EXPECT_EQ(FieldOf(bad([&](auto& p) { p.kind = static_cast<VarianceKind>(99); }), arg), "kind");
  ScheduleLimits huge;
  huge.max_steps = ScheduleLimits::kCeilingMaxSteps + 1;
  EXPECT_EQ(FieldOf(VarianceParams{}, limit, huge), "max_steps");
  ScheduleLimits raised;
  raised.max_steps = 200000;  // a caller may raise the limit
  EXPECT_EQ(FieldOf(bad([](auto& p) { p.steps = 150000; }), arg, raised), "no error");
}

TEST(VarianceValidation, NoNoiseAtStepOneIsNumerical) {
  // log-SNR 800 gives alpha_bar = 1 - e^{-800} = 1 exactly in double: nothing to denoise.
  VarianceParams p = Params(VarianceKind::kLogSnrLinear, 10);
  p.log_snr_max = 800;
  p.log_snr_min = 790;
  EXPECT_EQ(FieldOf(p, ErrorKind::kNumerical), "log_snr_max");
  // The same through a shift: 60 + 700 is past double precision too.
  p.log_snr_max = 60;
  p.log_snr_min = 50;
  EXPECT_EQ(FieldOf(p, ErrorKind::kNumerical), "no error");
  p.log_snr_shift = 700;
  EXPECT_EQ(FieldOf(p, ErrorKind::kNumerical), "log_snr_shift");
  // A sigmoid this steep (start/tau = -750) moves alpha_bar by less than e^{-745} at step 1.
  VarianceParams steep = Params(VarianceKind::kSigmoid, 1000);
  steep.sigmoid_tau = 0.004;
  EXPECT_EQ(FieldOf(steep, ErrorKind::kNumerical), "sigmoid_start");
}

}  // namespace
}  // namespace nucleate::schedule
