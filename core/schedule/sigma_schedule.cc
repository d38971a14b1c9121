#include "core/schedule/sigma_schedule.h"

#include <cmath>
#include <string>

#include "core/common/error.h"
#include "core/common/require.h"

namespace nucleate::schedule {
namespace {

// Matches the domain of the wrapped-normal functions: above 100 the distribution is uniform far
// beyond double precision.
constexpr double kMaxSigma = 100.0;

double GeometricSigma(const SigmaParams& p, double u) {
  return std::exp((1.0 - u) * std::log(p.sigma_min) + u * std::log(p.sigma_max));
}

// Karras et al. 2022, eq. 5 (from memory; written there from sigma_max down): interpolate
// sigma^(1/rho) linearly, which packs levels towards sigma_min for rho > 1.
double KarrasSigma(const SigmaParams& p, double u) {
  const double lo = std::pow(p.sigma_min, 1.0 / p.rho), hi = std::pow(p.sigma_max, 1.0 / p.rho);
  return std::pow(lo + u * (hi - lo), p.rho);
}

}  // namespace

void ValidateSigmaParams(const SigmaParams& p, const ScheduleLimits& limits) {
  ValidateScheduleLimits(limits);
  if (p.kind != SigmaKind::kGeometric && p.kind != SigmaKind::kKarras) {
    throw InvalidArgument("kind", "not a known sigma schedule kind");
  }
  if (p.steps < 1) throw InvalidArgument("steps", "must be >= 1");
  if (p.steps > limits.max_steps) {
    throw LimitExceeded("steps", "above max_steps = " + std::to_string(limits.max_steps));
  }
  RequireFinite("sigma_min", p.sigma_min);
  RequireFinite("sigma_max", p.sigma_max);
  RequireFinite("rho", p.rho);
  if (!(p.sigma_min >= 1e-150)) throw InvalidArgument("sigma_min", "must be >= 1e-150");
  if (p.sigma_max > kMaxSigma) throw InvalidArgument("sigma_max", "must be <= 100");
  if (p.sigma_min >= p.sigma_max) throw InvalidArgument("sigma_min", "must be < sigma_max");
  if (!(p.rho > 0.0)) throw InvalidArgument("rho", "must be > 0");
}

std::vector<SigmaLevel> BuildSigmaSchedule(const SigmaParams& p, const ScheduleLimits& limits) {
  ValidateSigmaParams(p, limits);
  std::vector<SigmaLevel> levels(p.steps);
  for (long long t = 1; t <= p.steps; ++t) {
    SigmaLevel& level = levels[t - 1];
    level.t = t;
    if (t == 1 && p.steps > 1) {
      level.sigma = p.sigma_min;  // endpoints exact, whatever pow and exp round to
    } else if (t == p.steps) {
      level.sigma = p.sigma_max;  // a one-step ladder is its largest level
    } else {
      const double u = static_cast<double>(t - 1) / (p.steps - 1);
      level.sigma = p.kind == SigmaKind::kKarras ? KarrasSigma(p, u) : GeometricSigma(p, u);
    }
    level.tv_distance_to_uniform = WrappedNormalTvDistanceToUniform(level.sigma);
    level.truncation =
        WrappedNormalTruncationBound(level.sigma, WrappedNormalImagesFor(level.sigma));
  }
  return levels;
}

}  // namespace nucleate::schedule
