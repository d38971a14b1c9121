// Variance-preserving (Gaussian) noise schedules: x_t = sqrt(alpha_bar_t) x_0 + sqrt(1 - alpha_bar_t) eps.
// Steps are numbered t = 1..T as in Ho et al. 2020; alpha_bar_0 = 1 (clean data).
#pragma once

#include <vector>

#include "core/schedule/limits.h"

namespace nucleate::schedule {

enum class VarianceKind {
  kLinear,        // Ho et al. 2020: beta linear from beta_start to beta_end
  kCosine,        // Nichol and Dhariwal 2021: alpha_bar = f(t)/f(0), f = cos^2(((t/T)+s)/(1+s) pi/2)
  kSigmoid,       // Chen 2023: alpha_bar from a sigmoid of a linear ramp between start and end over tau
  kLogSnrLinear,  // log-SNR linear in t from log_snr_max (t = 0) to log_snr_min (t = T)
};

struct VarianceParams {
  VarianceKind kind = VarianceKind::kLinear;
  long long steps = 1000;           // T before respacing
  double beta_start = 1e-4;         // linear
  double beta_end = 0.02;           // linear
  double cosine_offset = 0.008;     // cosine: s
  double max_beta = 0.999;          // cosine and sigmoid: betas clipped at this value
  double sigmoid_start = -3.0;      // sigmoid
  double sigmoid_end = 3.0;         // sigmoid
  double sigmoid_tau = 1.0;         // sigmoid
  double log_snr_max = 10.0;        // log-SNR linear, at t = 0
  double log_snr_min = -10.0;       // log-SNR linear, at t = T
  double log_snr_shift = 0.0;       // Hoogeboom et al. 2023: log-SNR + shift (negative = noisier)
  bool zero_terminal_snr = false;   // Lin et al. 2024: rescale sqrt(alpha_bar) so alpha_bar_T = 0
  long long respaced_steps = 0;     // 0: keep all T; else keep this many evenly spaced steps
};

// One row of the table. All values are for step t of the (possibly respaced) schedule.
struct VarianceStep {
  long long t = 0;            // 1..steps of the final table
  long long source_t = 0;     // the step of the original T-step schedule this row stands for
  double beta = 0, alpha = 0, alpha_bar = 0, sqrt_alpha_bar = 0, sqrt_one_minus_alpha_bar = 0;
  double snr = 0, log_snr = 0;
  // q(x_{t-1} | x_t, x_0): mean = coef_x0 * x_0 + coef_xt * x_t, variance = posterior_variance.
  double posterior_variance = 0;
  double posterior_log_variance_clipped = 0;  // log of the variance, with t = 1 taking t = 2's value
  double posterior_mean_coef_x0 = 0, posterior_mean_coef_xt = 0;
};

// Throws nucleate::Error naming the field (e.g. "beta_end") for a bad parameter or a size over
// the limits. Order of transformations: base schedule over T steps, log-SNR shift, zero terminal
// SNR rescale, respacing, then the per-step table.
void ValidateVarianceParams(const VarianceParams& params, const ScheduleLimits& limits);
std::vector<VarianceStep> BuildVarianceSchedule(const VarianceParams& params,
                                                const ScheduleLimits& limits);

}  // namespace nucleate::schedule
