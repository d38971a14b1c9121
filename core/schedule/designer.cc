#include "core/schedule/designer.h"

#include <algorithm>
#include <cmath>
#include <string>

#include "core/common/error.h"
#include "core/common/require.h"
#include "core/common/shortest_number.h"
#include "core/schedule/wrapped_normal.h"

namespace nucleate::schedule {
namespace {

void ValidateTargets(const DesignTargets& d, const ScheduleLimits& limits) {
  if (d.steps < 2) throw InvalidArgument("steps", "a designed schedule needs at least 2 steps");
  if (d.steps > limits.max_steps) {
    throw LimitExceeded("steps", "above max_steps = " + std::to_string(limits.max_steps));
  }
  switch (d.variance_kind) {
    case VarianceKind::kLinear:
    case VarianceKind::kCosine:
    case VarianceKind::kSigmoid:
    case VarianceKind::kLogSnrLinear: break;
    default: throw InvalidArgument("variance_kind", "not a known variance schedule kind");
  }
  if (d.sigma_kind != SigmaKind::kGeometric && d.sigma_kind != SigmaKind::kKarras) {
    throw InvalidArgument("sigma_kind", "not a known sigma schedule kind");
  }
  RequirePositiveFinite("terminal_snr", d.terminal_snr);
  RequirePositiveFinite("initial_snr", d.initial_snr);
  if (d.initial_snr <= d.terminal_snr) {
    throw InvalidArgument("initial_snr", "must be > terminal_snr (noise grows with t)");
  }
  RequirePositiveFinite("tv_distance", d.tv_distance);
  if (d.tv_distance >= 1.0) throw InvalidArgument("tv_distance", "must be < 1");
  RequirePositiveFinite("resolution_angstrom", d.resolution_angstrom);
  RequirePositiveFinite("cell_length_angstrom", d.cell_length_angstrom);
  if (d.resolution_angstrom / d.cell_length_angstrom < 1e-150) {
    throw InvalidArgument("resolution_angstrom", "too small relative to cell_length_angstrom");
  }
  // sigma_min = resolution / cell length: a resolution as coarse as the cell itself leaves
  // nothing for the coordinate noise to resolve.
  if (d.resolution_angstrom >= d.cell_length_angstrom) {
    throw InvalidArgument("resolution_angstrom", "must be below cell_length_angstrom (" +
                                                     FormatShortest(d.cell_length_angstrom) +
                                                     " A)");
  }
}

// log SNR at T of the linear schedule with the given ends, summed as BuildVarianceSchedule does.
double LinearTerminalLogSnr(long long steps, double beta_start, double beta_end) {
  double log_alpha_bar = 0.0;
  for (long long t = 1; t <= steps; ++t) {
    const double u = static_cast<double>(t - 1) / (steps - 1);
    log_alpha_bar += std::log1p(-(beta_start + (beta_end - beta_start) * u));
  }
  return log_alpha_bar - std::log(-std::expm1(log_alpha_bar));
}

// beta_1 fixes the SNR at step 1: snr_1 = (1 - beta_1) / beta_1. The terminal log-SNR falls
// monotonically as beta_end grows, so beta_end is found by bisection on [beta_start, 1).
void DesignLinear(const DesignTargets& d, VarianceParams& v) {
  v.beta_start = 1.0 / (1.0 + d.initial_snr);
  const double target = std::log(d.terminal_snr);
  double lo = v.beta_start, hi = std::nextafter(1.0, 0.0);
  if (LinearTerminalLogSnr(d.steps, lo, lo) < target) {
    throw InvalidArgument("terminal_snr",
                          "already passed with a constant beta = beta_start; "
                          "raise terminal_snr, lower initial_snr or use fewer steps");
  }
  if (LinearTerminalLogSnr(d.steps, lo, hi) > target) {
    throw InvalidArgument("terminal_snr", "not reachable by a linear schedule with beta_end < 1");
  }
  for (int iter = 0; iter < 200; ++iter) {
    const double mid = 0.5 * (lo + hi);
    if (mid <= lo || mid >= hi) break;
    (LinearTerminalLogSnr(d.steps, v.beta_start, mid) > target ? lo : hi) = mid;
  }
  // Of the two bracketing ends, keep the one whose SNR is closer to the target.
  const double err_lo = std::fabs(LinearTerminalLogSnr(d.steps, v.beta_start, lo) - target);
  const double err_hi = std::fabs(LinearTerminalLogSnr(d.steps, v.beta_start, hi) - target);
  v.beta_end = err_lo <= err_hi ? lo : hi;
}

// lambda(u) = (1 - u) lambda_max + u lambda_min with lambda(1) = log(terminal_snr) and
// lambda(1/T) = log(initial_snr).
void DesignLogSnrLinear(const DesignTargets& d, VarianceParams& v) {
  const double T = static_cast<double>(d.steps);
  v.log_snr_min = std::log(d.terminal_snr);
  v.log_snr_max = (T * std::log(d.initial_snr) - v.log_snr_min) / (T - 1.0);
}

// A log-SNR shift moves log SNR at T by exactly the shift (Hoogeboom et al. 2023), so the shift
// that meets the target is the difference of logs.
void DesignByShift(VarianceParams& v, const ScheduleLimits& limits, double terminal_snr) {
  v.log_snr_shift = 0.0;
  const double base = BuildVarianceSchedule(v, limits).back().log_snr;
  if (!std::isfinite(base)) {
    throw Numerical("variance_kind", "the base schedule's terminal SNR is not finite");
  }
  v.log_snr_shift = std::log(terminal_snr) - base;
}

double DesignSigmaMax(double sigma_min, double tv_target) {
  if (WrappedNormalTvDistanceToUniform(sigma_min) <= tv_target) {
    throw InvalidArgument("tv_distance",
                          "already reached at sigma_min = resolution_angstrom / "
                          "cell_length_angstrom; ask for a smaller distance");
  }
  // TV falls monotonically with sigma (convolution with a further wrapped normal contracts it);
  // at sigma = 8 it is below 1e-300, so the doubling ends.
  double lo = sigma_min, hi = std::max(1.0, 2.0 * sigma_min);
  while (WrappedNormalTvDistanceToUniform(hi) > tv_target) {
    lo = hi;
    hi *= 2.0;
  }
  for (int iter = 0; iter < 200; ++iter) {
    const double mid = 0.5 * (lo + hi);
    if (mid <= lo || mid >= hi) break;
    (WrappedNormalTvDistanceToUniform(mid) > tv_target ? lo : hi) = mid;
  }
  return hi;  // the invariant keeps TV(hi) <= target
}

}  // namespace

Design DesignSchedules(const DesignTargets& targets, const ScheduleLimits& limits) {
  ValidateTargets(targets, limits);
  Design design;
  VarianceParams& v = design.variance;
  v.kind = targets.variance_kind;
  v.steps = targets.steps;
  ValidateVarianceParams(v, limits);  // limits themselves, before any work
  switch (targets.variance_kind) {
    case VarianceKind::kLinear: DesignLinear(targets, v); break;
    case VarianceKind::kLogSnrLinear: DesignLogSnrLinear(targets, v); break;
    case VarianceKind::kCosine:
    case VarianceKind::kSigmoid: DesignByShift(v, limits, targets.terminal_snr); break;
  }
  const std::vector<VarianceStep> table = BuildVarianceSchedule(v, limits);

  SigmaParams& s = design.sigma;
  s.kind = targets.sigma_kind;
  s.steps = targets.steps;
  s.sigma_min = targets.resolution_angstrom / targets.cell_length_angstrom;
  s.sigma_max = DesignSigmaMax(s.sigma_min, targets.tv_distance);
  ValidateSigmaParams(s, limits);

  DesignDiagnostics& diag = design.diagnostics;
  diag.achieved_terminal_snr = table.back().snr;
  diag.achieved_initial_snr = table.front().snr;
  // From t = 2: log SNR at t = 0 is +infinity.
  for (size_t i = 1; i < table.size(); ++i) {
    diag.max_log_snr_step =
        std::max(diag.max_log_snr_step, std::fabs(table[i].log_snr - table[i - 1].log_snr));
  }
  diag.tv_distance_at_sigma_max = WrappedNormalTvDistanceToUniform(s.sigma_max);
  diag.finest_displacement_angstrom = s.sigma_min * targets.cell_length_angstrom;
  diag.coarsest_displacement_angstrom = s.sigma_max * targets.cell_length_angstrom;
  return design;
}

}  // namespace nucleate::schedule
