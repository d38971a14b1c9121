#include "core/schedule/variance_schedule.h"

#include <algorithm>
#include <cmath>
#include <limits>
#include <string>

#include "core/common/error.h"
#include "core/common/require.h"

namespace nucleate::schedule {
namespace {

constexpr double kPi = 3.14159265358979323846;

// The schedule before the per-step table: beta[t], alpha[t] = 1 - beta[t] and log(alpha_bar[t])
// for t = 0..T (index 0 unused but log_alpha_bar[0] = 0). Working with log(alpha_bar) keeps
// 1 - alpha_bar exact through expm1 when alpha_bar is within rounding of 1, and lets alpha_bar
// reach 0 as -infinity. alpha is kept beside beta because whichever of the two is small must be
// computed directly: 1 - beta loses digits when beta is ~1, 1 - alpha when alpha is ~1.
struct Curve {
  std::vector<double> beta;
  std::vector<double> alpha;
  std::vector<double> log_alpha_bar;
  std::vector<long long> source_t;
};

Curve EmptyCurve(long long steps) {
  Curve c;
  c.beta.assign(steps + 1, 0.0);
  c.alpha.assign(steps + 1, 1.0);
  c.log_alpha_bar.assign(steps + 1, 0.0);
  c.source_t.resize(steps + 1);
  for (long long t = 0; t <= steps; ++t) c.source_t[t] = t;
  return c;
}

// For schedules defined by their betas.
void AccumulateLogAlphaBar(Curve& c) {
  for (size_t t = 1; t < c.beta.size(); ++t) {
    c.alpha[t] = 1.0 - c.beta[t];
    c.log_alpha_bar[t] = c.log_alpha_bar[t - 1] + std::log1p(-c.beta[t]);
  }
}

// beta_t = 1 - alpha_bar_t / alpha_bar_{t-1}. Only the last step can hold alpha_bar = 0, so the
// -inf - (-inf) case does not arise; it is still mapped to beta = 1 to stay well defined.
void BetasFromLogAlphaBar(Curve& c) {
  for (size_t t = 1; t < c.beta.size(); ++t) {
    const double prev = c.log_alpha_bar[t - 1], cur = c.log_alpha_bar[t];
    const double log_alpha =
        std::isinf(prev) ? -std::numeric_limits<double>::infinity() : cur - prev;
    c.beta[t] = -std::expm1(log_alpha);
    c.alpha[t] = std::exp(log_alpha);
  }
}

double LogSigmoid(double x) {
  return x < 0.0 ? x - std::log1p(std::exp(x)) : -std::log1p(std::exp(-x));
}

// log cosh x without overflow.
double LogCosh(double x) {
  const double a = std::fabs(x);
  return a + std::log1p(std::exp(-2.0 * a)) - std::log(2.0);
}

// Ho et al. 2020, sec. 4: beta linear in t from beta_start to beta_end.
Curve LinearCurve(const VarianceParams& p) {
  Curve c = EmptyCurve(p.steps);
  for (long long t = 1; t <= p.steps; ++t) {
    const double u = p.steps == 1 ? 0.0 : static_cast<double>(t - 1) / (p.steps - 1);
    c.beta[t] = p.beta_start + (p.beta_end - p.beta_start) * u;
  }
  AccumulateLogAlphaBar(c);
  return c;
}

// Nichol and Dhariwal 2021, eq. 17: f(t) = cos^2(((t/T) + s)/(1 + s) pi/2), beta_t = 1 -
// f(t)/f(t-1) clipped at max_beta, alpha_bar the product of the clipped betas. With angles a < b,
// f(t-1) - f(t) = cos^2 a - cos^2 b = sin(b - a) sin(b + a), which avoids the cancellation of
// 1 - f(t)/f(t-1) when beta is ~1e-5.
Curve CosineCurve(const VarianceParams& p) {
  Curve c = EmptyCurve(p.steps);
  const double scale = 0.5 * kPi / (1.0 + p.cosine_offset);
  const double half_step_angle = scale / static_cast<double>(p.steps);
  for (long long t = 1; t <= p.steps; ++t) {
    const double a = (static_cast<double>(t - 1) / p.steps + p.cosine_offset) * scale;
    const double b = (static_cast<double>(t) / p.steps + p.cosine_offset) * scale;
    const double cos_a = std::cos(a);
    const double beta = std::sin(half_step_angle) * std::sin(a + b) / (cos_a * cos_a);
    c.beta[t] = std::min(beta, p.max_beta);
  }
  AccumulateLogAlphaBar(c);
  return c;
}

// Chen 2023: alpha_bar(u) = (v_end - sigmoid(x_u)) / (v_end - v_start), x_u = (start + u (end -
// start)) / tau. Consecutive ratio, with sigmoid(a) - sigmoid(b) = sinh((a-b)/2) / (2 cosh(a/2)
// cosh(b/2)):  beta_t = sinh(dx/2) cosh(e/2) / (cosh(x_t/2) sinh((e - x_{t-1})/2)), e = end/tau,
// evaluated through logs so that neither cancellation nor overflow (|x| > 1400) can occur.
Curve SigmoidCurve(const VarianceParams& p) {
  Curve c = EmptyCurve(p.steps);
  const double e = p.sigmoid_end / p.sigmoid_tau;
  auto x_at = [&](long long t) {
    const double u = static_cast<double>(t) / p.steps;
    return ((1.0 - u) * p.sigmoid_start + u * p.sigmoid_end) / p.sigmoid_tau;
  };
  for (long long t = 1; t <= p.steps; ++t) {
    const double x_prev = x_at(t - 1), x_cur = x_at(t);
    const double half_dx = 0.5 * (x_cur - x_prev);
    const double half_rest = 0.5 * (e - x_prev);  // >= half_dx > 0
    // sinh(p)/sinh(q) = e^{p-q} expm1(-2p)/expm1(-2q)
    const double sinh_ratio =
        std::exp(half_dx - half_rest) * std::expm1(-2.0 * half_dx) / std::expm1(-2.0 * half_rest);
    const double beta = sinh_ratio * std::exp(LogCosh(0.5 * e) - LogCosh(0.5 * x_cur));
    c.beta[t] = std::min(beta, p.max_beta);
  }
  AccumulateLogAlphaBar(c);
  return c;
}

// log-SNR linear in u = t/T from log_snr_max (u = 0) to log_snr_min (u = 1); alpha_bar =
// sigmoid(log-SNR). Written as a weighted mean so that both endpoints are exact.
Curve LogSnrLinearCurve(const VarianceParams& p) {
  Curve c = EmptyCurve(p.steps);
  for (long long t = 1; t <= p.steps; ++t) {
    const double u = static_cast<double>(t) / p.steps;
    c.log_alpha_bar[t] = LogSigmoid((1.0 - u) * p.log_snr_max + u * p.log_snr_min);
  }
  BetasFromLogAlphaBar(c);
  return c;
}

double LogSnrFromLogAlphaBar(double log_alpha_bar) {
  return log_alpha_bar - std::log(-std::expm1(log_alpha_bar));
}

// Hoogeboom et al. 2023 (simple diffusion): log-SNR + shift, alpha_bar = sigmoid of the result.
void ApplyLogSnrShift(Curve& c, double shift) {
  for (size_t t = 1; t < c.log_alpha_bar.size(); ++t) {
    c.log_alpha_bar[t] = LogSigmoid(LogSnrFromLogAlphaBar(c.log_alpha_bar[t]) + shift);
  }
  BetasFromLogAlphaBar(c);
}

// Lin et al. 2024, Algorithm 1: s' = (s - s_T) k, k = s_1 / (s_1 - s_T), s = sqrt(alpha_bar), so
// that step 1 is unchanged and step T is 0. Where s' ~ 1 (early steps), 1 - s'^2 would lose
// digits, so 1 - s' is formed from 1 - s (through expm1) instead: from the same equation,
// 1 - s' = k ((1 - s) - s_T (1 - s_1) / s_1). Where s' is small the direct form is the accurate
// one. Steps 1 and T are set exactly.
void ApplyZeroTerminalSnr(Curve& c) {
  const size_t last = c.log_alpha_bar.size() - 1;
  const double first = std::exp(0.5 * c.log_alpha_bar[1]);
  const double terminal = std::exp(0.5 * c.log_alpha_bar[last]);
  if (!(first > terminal)) {
    throw Numerical("zero_terminal_snr",
                    "sqrt(alpha_bar) at step 1 and step T are equal in double precision; "
                    "the schedule adds almost no noise");
  }
  const double scale = first / (first - terminal);
  const double first_gap = -std::expm1(0.5 * c.log_alpha_bar[1]);  // 1 - s_1
  for (size_t t = 2; t < last; ++t) {
    const double direct = (std::exp(0.5 * c.log_alpha_bar[t]) - terminal) * scale;
    if (direct < 0.5) {
      c.log_alpha_bar[t] = 2.0 * std::log(direct);
    } else {
      const double gap = -std::expm1(0.5 * c.log_alpha_bar[t]);  // 1 - s
      c.log_alpha_bar[t] = 2.0 * std::log1p(-scale * (gap - terminal * first_gap / first));
    }
  }
  c.log_alpha_bar[last] = -std::numeric_limits<double>::infinity();
  BetasFromLogAlphaBar(c);
}

// Nichol and Dhariwal 2021, sec. 4 (respacing): keep n evenly spaced steps source_i = round(i T /
// n), i = 1..n, which end at T and strictly increase because T / n >= 1; alpha_bar is kept exactly
// at those steps and the betas follow from its ratios.
Curve Respace(const Curve& c, long long n) {
  const long long steps = static_cast<long long>(c.beta.size()) - 1;
  Curve r = EmptyCurve(n);
  for (long long i = 1; i <= n; ++i) {
    const long long source = (2 * i * steps + n) / (2 * n);  // round half up, in integers
    r.source_t[i] = source;
    r.log_alpha_bar[i] = c.log_alpha_bar[source];
  }
  BetasFromLogAlphaBar(r);
  return r;
}

const char* FieldSettingFirstStep(const VarianceParams& p) {
  if (p.log_snr_shift != 0.0) return "log_snr_shift";
  switch (p.kind) {
    case VarianceKind::kLinear: return "beta_start";
    case VarianceKind::kCosine: return "cosine_offset";
    case VarianceKind::kSigmoid: return "sigmoid_start";
    case VarianceKind::kLogSnrLinear: return "log_snr_max";
  }
  return "kind";
}

std::vector<VarianceStep> Tabulate(const Curve& c, const VarianceParams& p) {
  const size_t n = c.beta.size() - 1;
  std::vector<VarianceStep> rows(n);
  for (size_t t = 1; t <= n; ++t) {
    const double log_ab = c.log_alpha_bar[t], log_ab_prev = c.log_alpha_bar[t - 1];
    const double one_minus_ab = -std::expm1(log_ab);
    const double one_minus_ab_prev = t == 1 ? 0.0 : -std::expm1(log_ab_prev);  // not -0.0
    if (!(one_minus_ab > 0.0) || std::isnan(log_ab) || std::isnan(c.beta[t])) {
      throw Numerical(FieldSettingFirstStep(p),
                      "alpha_bar at step " + std::to_string(t) +
                          " is 1 in double precision (or not a number): the schedule adds no "
                          "noise there and the posterior is undefined");
    }
    VarianceStep& s = rows[t - 1];
    s.t = static_cast<long long>(t);
    s.source_t = c.source_t[t];
    s.beta = c.beta[t];
    s.alpha = c.alpha[t];
    s.alpha_bar = std::exp(log_ab);
    s.sqrt_alpha_bar = std::exp(0.5 * log_ab);
    s.sqrt_one_minus_alpha_bar = std::sqrt(one_minus_ab);
    s.snr = s.alpha_bar / one_minus_ab;
    s.log_snr = log_ab - std::log(one_minus_ab);
    // Ho et al. 2020, eqs. 6-7: q(x_{t-1} | x_t, x_0).
    s.posterior_variance = s.beta * one_minus_ab_prev / one_minus_ab;
    s.posterior_mean_coef_x0 = s.beta * std::exp(0.5 * log_ab_prev) / one_minus_ab;
    s.posterior_mean_coef_xt = one_minus_ab_prev * std::sqrt(s.alpha) / one_minus_ab;
  }
  // The variance at t = 1 is 0; its log is taken from t = 2 (common practice, no source beyond the
  // DDPM reference code), or from beta_1 when there is only one step.
  for (size_t t = 2; t <= n; ++t) {
    rows[t - 1].posterior_log_variance_clipped = std::log(rows[t - 1].posterior_variance);
  }
  rows[0].posterior_log_variance_clipped =
      n >= 2 ? rows[1].posterior_log_variance_clipped : std::log(rows[0].beta);
  // A sampler adds exp(log variance) noise: -infinity here means a step whose noise underflowed.
  for (const VarianceStep& s : rows) {
    if (!std::isfinite(s.posterior_log_variance_clipped)) {
      throw Numerical(FieldSettingFirstStep(p), "posterior variance underflows to 0 at step " +
                                                    std::to_string(s.t) +
                                                    ": the schedule adds too little noise there");
    }
  }
  return rows;
}

}  // namespace

void ValidateVarianceParams(const VarianceParams& p, const ScheduleLimits& limits) {
  ValidateScheduleLimits(limits);
  switch (p.kind) {
    case VarianceKind::kLinear:
    case VarianceKind::kCosine:
    case VarianceKind::kSigmoid:
    case VarianceKind::kLogSnrLinear: break;
    default: throw InvalidArgument("kind", "not a known variance schedule kind");
  }
  if (p.steps < 1) throw InvalidArgument("steps", "must be >= 1");
  if (p.steps > limits.max_steps) {
    throw LimitExceeded("steps", "above max_steps = " + std::to_string(limits.max_steps));
  }
  // Every field is checked whatever the kind, so a stray NaN is never silently carried along.
  RequireFinite("beta_start", p.beta_start);
  RequireFinite("beta_end", p.beta_end);
  if (!(p.beta_start > 0.0 && p.beta_start < 1.0))
    throw InvalidArgument("beta_start", "must lie in (0, 1)");
  if (!(p.beta_end > 0.0 && p.beta_end < 1.0))
    throw InvalidArgument("beta_end", "must lie in (0, 1)");
  if (p.beta_start > p.beta_end) throw InvalidArgument("beta_start", "must be <= beta_end");
  RequireFinite("cosine_offset", p.cosine_offset);
  if (p.cosine_offset < 0.0) throw InvalidArgument("cosine_offset", "must be >= 0");
  RequireFinite("max_beta", p.max_beta);
  if (!(p.max_beta > 0.0 && p.max_beta <= 1.0))
    throw InvalidArgument("max_beta", "must lie in (0, 1]");
  RequireFinite("sigmoid_start", p.sigmoid_start);
  RequireFinite("sigmoid_end", p.sigmoid_end);
  RequireFinite("sigmoid_tau", p.sigmoid_tau);
  if (p.sigmoid_start >= p.sigmoid_end)
    throw InvalidArgument("sigmoid_start", "must be < sigmoid_end");
  if (!(p.sigmoid_tau > 0.0)) throw InvalidArgument("sigmoid_tau", "must be > 0");
  RequireFinite("log_snr_max", p.log_snr_max);
  RequireFinite("log_snr_min", p.log_snr_min);
  if (p.log_snr_min >= p.log_snr_max) throw InvalidArgument("log_snr_min", "must be < log_snr_max");
  RequireFinite("log_snr_shift", p.log_snr_shift);
  if (p.zero_terminal_snr && p.steps < 2) {
    throw InvalidArgument("zero_terminal_snr",
                          "needs steps >= 2 (step 1 is kept, step T is zeroed)");
  }
  if (p.respaced_steps < 0)
    throw InvalidArgument("respaced_steps", "must be >= 0 (0 keeps all steps)");
  if (p.respaced_steps > p.steps) throw InvalidArgument("respaced_steps", "must be <= steps");
}

std::vector<VarianceStep> BuildVarianceSchedule(const VarianceParams& p,
                                                const ScheduleLimits& limits) {
  ValidateVarianceParams(p, limits);
  Curve c;
  switch (p.kind) {
    case VarianceKind::kLinear: c = LinearCurve(p); break;
    case VarianceKind::kCosine: c = CosineCurve(p); break;
    case VarianceKind::kSigmoid: c = SigmoidCurve(p); break;
    case VarianceKind::kLogSnrLinear: c = LogSnrLinearCurve(p); break;
  }
  if (p.log_snr_shift != 0.0) ApplyLogSnrShift(c, p.log_snr_shift);
  if (p.zero_terminal_snr) ApplyZeroTerminalSnr(c);
  // Respacing to all T steps is the identity; skipping it keeps the original betas bit for bit.
  if (p.respaced_steps != 0 && p.respaced_steps != p.steps) c = Respace(c, p.respaced_steps);
  return Tabulate(c, p);
}

}  // namespace nucleate::schedule
