#include "core/schedule/discrete_transitions.h"

#include <cmath>
#include <string>

#include "core/common/error.h"

namespace nucleate::schedule {
namespace {

constexpr double kPi = 3.14159265358979323846;

void CheckKind(TransitionKind kind) {
  if (kind != TransitionKind::kUniform && kind != TransitionKind::kAbsorbing) {
    throw InvalidArgument("kind", "not a known transition kind");
  }
}

// Matrices are built outside any request too (tests, samplers), so the hard ceiling is the guard.
void CheckClassCount(long long num_classes) {
  if (num_classes < 2) throw InvalidArgument("num_classes", "must be >= 2");
  if (num_classes > ScheduleLimits::kCeilingMaxClasses) {
    throw LimitExceeded("num_classes", "above the ceiling of " +
                                           std::to_string(ScheduleLimits::kCeilingMaxClasses));
  }
}

// Austin et al. 2021, sec. 3 (uniform and absorbing kernels), parameterised by the probability of
// leaving the current class for the kernel's target.
Eigen::MatrixXd KernelLeavingWith(TransitionKind kind, long long k, double leave) {
  Eigen::MatrixXd q = (1.0 - leave) * Eigen::MatrixXd::Identity(k, k);
  if (kind == TransitionKind::kUniform) {
    q.array() += leave / static_cast<double>(k);
  } else {
    q.col(k - 1).array() += leave;  // everything that leaves goes to the mask class m = K - 1
  }
  return q;
}

// Cosine retention: alpha_bar_t = f(t) / f(0), f(t) = cos^2(((t/T) + s)/(1 + s) pi/2) (Nichol and
// Dhariwal 2021, eq. 17; Austin et al. 2021 use it for discrete noise, from memory). beta_t uses
// f(t-1) - f(t) = sin(b - a) sin(b + a) to avoid cancellation; f(T) = 0 exactly, so beta_T = 1.
void FillCosine(std::vector<TransitionStep>& steps, long long T, double s) {
  const double scale = 0.5 * kPi / (1.0 + s);
  const double cos0 = std::cos(s * scale);
  const double step_angle = scale / static_cast<double>(T);
  for (long long t = 1; t <= T; ++t) {
    TransitionStep& row = steps[t - 1];
    row.t = t;
    if (t == T) {
      row.alpha_bar = 0.0;
      row.beta = 1.0;
      continue;
    }
    const double a = (static_cast<double>(t - 1) / T + s) * scale;
    const double b = (static_cast<double>(t) / T + s) * scale;
    const double cos_a = std::cos(a), cos_b = std::cos(b);
    row.alpha_bar = (cos_b * cos_b) / (cos0 * cos0);
    row.beta = std::sin(step_angle) * std::sin(a + b) / (cos_a * cos_a);
  }
}

}  // namespace

void ValidateTransitionParams(const TransitionParams& p, const ScheduleLimits& limits) {
  ValidateScheduleLimits(limits);
  CheckKind(p.kind);
  if (p.retention != RetentionKind::kCosine && p.retention != RetentionKind::kReciprocal) {
    throw InvalidArgument("retention", "not a known retention kind");
  }
  if (p.steps < 1) throw InvalidArgument("steps", "must be >= 1");
  if (p.steps > limits.max_steps) {
    throw LimitExceeded("steps", "above max_steps = " + std::to_string(limits.max_steps));
  }
  if (p.num_classes < 2) throw InvalidArgument("num_classes", "must be >= 2");
  if (p.num_classes > limits.max_classes) {
    throw LimitExceeded("num_classes", "above max_classes = " + std::to_string(limits.max_classes));
  }
  if (!std::isfinite(p.cosine_offset))
    throw InvalidArgument("cosine_offset", "must be a finite number");
  if (p.cosine_offset < 0.0) throw InvalidArgument("cosine_offset", "must be >= 0");
}

std::vector<TransitionStep> BuildTransitionSchedule(const TransitionParams& p,
                                                    const ScheduleLimits& limits) {
  ValidateTransitionParams(p, limits);
  std::vector<TransitionStep> steps(p.steps);
  if (p.retention == RetentionKind::kCosine) {
    FillCosine(steps, p.steps, p.cosine_offset);
    return steps;
  }
  // Austin et al. 2021 (absorbing; section from memory): beta_t = 1/(T - t + 1), so that
  // alpha_bar_t = prod_{s<=t} (T - s)/(T - s + 1) = (T - t)/T telescopes.
  for (long long t = 1; t <= p.steps; ++t) {
    TransitionStep& row = steps[t - 1];
    row.t = t;
    row.beta = 1.0 / static_cast<double>(p.steps - t + 1);
    row.alpha_bar = static_cast<double>(p.steps - t) / static_cast<double>(p.steps);
  }
  return steps;
}

Eigen::MatrixXd TransitionMatrix(TransitionKind kind, long long num_classes, double beta) {
  CheckKind(kind);
  CheckClassCount(num_classes);
  if (!(beta >= 0.0 && beta <= 1.0)) throw InvalidArgument("beta", "must lie in [0, 1]");
  return KernelLeavingWith(kind, num_classes, beta);
}

Eigen::MatrixXd CumulativeTransitionMatrix(TransitionKind kind, long long num_classes,
                                           double alpha_bar) {
  CheckKind(kind);
  CheckClassCount(num_classes);
  if (!(alpha_bar >= 0.0 && alpha_bar <= 1.0)) {
    throw InvalidArgument("alpha_bar", "must lie in [0, 1]");
  }
  return KernelLeavingWith(kind, num_classes, 1.0 - alpha_bar);
}

}  // namespace nucleate::schedule
