#include "core/schedule/discrete_transitions.h"

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

TEST(TransitionMatrix, RowStochasticWithTheRightTarget) {
  // Austin et al. 2021, sec. 3: uniform Q = (1-b) I + b/K 1 1^T; absorbing Q = (1-b) I + b 1 e_m^T.
  for (TransitionKind kind : {TransitionKind::kUniform, TransitionKind::kAbsorbing}) {
    for (long long k : {2LL, 5LL, 17LL}) {
      for (double beta : {0.0, 0.3, 1.0}) {
        const Eigen::MatrixXd q = TransitionMatrix(kind, k, beta);
        ASSERT_EQ(q.rows(), k);
        ASSERT_EQ(q.cols(), k);
        EXPECT_GE(q.minCoeff(), 0.0);
        for (long long i = 0; i < k; ++i) EXPECT_NEAR(q.row(i).sum(), 1.0, 1e-15);
        if (kind == TransitionKind::kAbsorbing) {
          // The mask class never leaves.
          EXPECT_EQ(q(k - 1, k - 1), 1.0);
          EXPECT_EQ(q.row(k - 1).sum(), 1.0);
          for (long long i = 0; i + 1 < k; ++i) EXPECT_DOUBLE_EQ(q(i, k - 1), beta);
        } else {
          EXPECT_DOUBLE_EQ(q(0, 1), beta / k);
          EXPECT_DOUBLE_EQ(q(0, 0), 1 - beta + beta / k);
        }
      }
    }
  }
}

TEST(TransitionMatrix, FullNoiseReachesTheStationaryLaw) {
  const Eigen::MatrixXd u = TransitionMatrix(TransitionKind::kUniform, 4, 1.0);
  EXPECT_NEAR((u - Eigen::MatrixXd::Constant(4, 4, 0.25)).cwiseAbs().maxCoeff(), 0.0, 1e-16);
  const Eigen::MatrixXd a = TransitionMatrix(TransitionKind::kAbsorbing, 4, 1.0);
  for (int i = 0; i < 4; ++i) EXPECT_EQ(a(i, 3), 1.0);
}

TEST(TransitionSchedule, ProductOfStepsIsTheCumulativeMatrix) {
  // Austin et al. 2021, sec. 3: Q_bar_t = Q_1 ... Q_t has the same form with 1 - alpha_bar_t,
  // alpha_bar_t = prod (1 - beta_s). Multiplied out here step by step.
  for (TransitionKind kind : {TransitionKind::kUniform, TransitionKind::kAbsorbing}) {
    for (RetentionKind retention : {RetentionKind::kReciprocal, RetentionKind::kCosine}) {
      TransitionParams p;
      p.kind = kind;
      p.retention = retention;
      p.steps = 100;
      p.num_classes = 5;
      const auto steps = BuildTransitionSchedule(p, kLimits);
      Eigen::MatrixXd product = Eigen::MatrixXd::Identity(5, 5);
      for (const auto& s : steps) {
        product = product * TransitionMatrix(kind, 5, s.beta);
        const Eigen::MatrixXd cumulative = CumulativeTransitionMatrix(kind, 5, s.alpha_bar);
        EXPECT_LT((product - cumulative).cwiseAbs().maxCoeff(), 1e-12) << "t " << s.t;
      }
    }
  }
}

TEST(TransitionSchedule, ReciprocalRetention) {
  // beta_t = 1/(T - t + 1) telescopes to alpha_bar_t = 1 - t/T (Austin et al. 2021, from memory).
  TransitionParams p;
  p.num_classes = 3;
  const auto steps = BuildTransitionSchedule(p, kLimits);
  ASSERT_EQ(steps.size(), 1000u);
  for (const auto& s : steps) {
    EXPECT_EQ(s.beta, 1.0 / (1000 - s.t + 1));
    EXPECT_NEAR(s.alpha_bar, 1.0 - s.t / 1000.0, 1e-15);
  }
  EXPECT_EQ(steps.back().beta, 1.0);
  EXPECT_EQ(steps.back().alpha_bar, 0.0);
}

TEST(TransitionSchedule, CosineRetention) {
  // Nichol and Dhariwal 2021, eq. 17: alpha_bar_t = f(t)/f(0), here in long double.
  TransitionParams p;
  p.retention = RetentionKind::kCosine;
  p.num_classes = 3;
  p.steps = 500;
  const auto steps = BuildTransitionSchedule(p, kLimits);
  auto f = [&](long double t) {
    const long double c = std::cos((t / p.steps + p.cosine_offset) / (1 + p.cosine_offset) *
                                   static_cast<long double>(kPi) / 2);
    return c * c;
  };
  for (const auto& s : steps) {
    if (s.t == p.steps) break;
    const double expected = static_cast<double>(f(s.t) / f(0));
    EXPECT_NEAR(s.alpha_bar / expected, 1.0, 1e-12) << s.t;
    const double expected_beta = static_cast<double>(1 - f(s.t) / f(s.t - 1));
    EXPECT_NEAR(s.beta / expected_beta, 1.0, 1e-9) << s.t;
  }
  // f(T) = cos^2(pi/2) = 0: everything has left by the last step.
  EXPECT_EQ(steps.back().alpha_bar, 0.0);
  EXPECT_EQ(steps.back().beta, 1.0);
}

std::string FieldOf(std::function<void()> call, ErrorKind expected_kind) {
  try {
    call();
  } catch (const Error& e) {
    EXPECT_EQ(static_cast<int>(e.kind()), static_cast<int>(expected_kind)) << e.what();
    return e.field();
  }
  return "no error";
}

TEST(TransitionValidation, EveryErrorNamesItsField) {
  const ErrorKind arg = ErrorKind::kInvalidArgument, limit = ErrorKind::kLimitExceeded;
  const auto build = [](std::function<void(TransitionParams&)> edit) {
    return [edit] {
      TransitionParams p;
      p.num_classes = 4;
      edit(p);
      BuildTransitionSchedule(p, kLimits);
    };
  };
  EXPECT_EQ(FieldOf(build([](auto&) {}), arg), "no error");
  EXPECT_EQ(FieldOf(build([](auto& p) { p.num_classes = 1; }), arg), "num_classes");
  EXPECT_EQ(FieldOf(build([](auto& p) { p.num_classes = 0; }), arg), "num_classes");
  EXPECT_EQ(FieldOf(build([](auto& p) { p.num_classes = 257; }), limit), "num_classes");
  EXPECT_EQ(FieldOf(build([](auto& p) { p.steps = 0; }), arg), "steps");
  EXPECT_EQ(FieldOf(build([](auto& p) { p.steps = 100001; }), limit), "steps");
  EXPECT_EQ(FieldOf(build([](auto& p) { p.cosine_offset = -1; }), arg), "cosine_offset");
  EXPECT_EQ(FieldOf(build([](auto& p) { p.cosine_offset = std::nan(""); }), arg), "cosine_offset");
  EXPECT_EQ(FieldOf(build([](auto& p) { p.kind = static_cast<TransitionKind>(9); }), arg), "kind");
  EXPECT_EQ(FieldOf(build([](auto& p) { p.retention = static_cast<RetentionKind>(9); }), arg),
            "retention");
  EXPECT_EQ(FieldOf([] { TransitionMatrix(TransitionKind::kUniform, 4, 1.5); }, arg), "beta");
  EXPECT_EQ(FieldOf([] { TransitionMatrix(TransitionKind::kUniform, 4, std::nan("")); }, arg),
            "beta");
  EXPECT_EQ(FieldOf([] { TransitionMatrix(TransitionKind::kUniform, 1, 0.5); }, arg),
            "num_classes");
  EXPECT_EQ(FieldOf([] { CumulativeTransitionMatrix(TransitionKind::kAbsorbing, 4, -0.1); }, arg),
            "alpha_bar");
  EXPECT_EQ(
      FieldOf([] { CumulativeTransitionMatrix(TransitionKind::kAbsorbing, 5000, 0.5); }, limit),
      "num_classes");
}

}  // namespace
}  // namespace nucleate::schedule
