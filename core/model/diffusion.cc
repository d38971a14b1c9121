#include "core/model/diffusion.h"

#include <algorithm>
#include <cmath>
#include <string>

#include "core/common/error.h"
#include "core/schedule/limits.h"
#include "core/schedule/wrapped_normal.h"

namespace nucleate::model {
namespace {

template <typename F>
auto WithinPart(const char* part, F&& build) {
  try {
    return build();
  } catch (const Error& e) {
    throw e.WithinField(part);
  }
}

}  // namespace

ModelSchedules DefaultModelSchedules() {
  ModelSchedules s;
  schedule::VarianceParams& lattice = s.lattice;
  schedule::SigmaParams& coordinates = s.coordinates;
  schedule::TransitionParams& species = s.species;
  lattice.kind = schedule::VarianceKind::kCosine;
  lattice.steps = 1000;
  coordinates.kind = schedule::SigmaKind::kGeometric;
  coordinates.steps = 1000;
  coordinates.sigma_min = 0.005;
  coordinates.sigma_max = 0.5;
  species.kind = schedule::TransitionKind::kAbsorbing;
  species.retention = schedule::RetentionKind::kReciprocal;
  species.steps = 1000;
  return s;
}

DiffusionProcess::DiffusionProcess(const ModelSchedules& s, const Architecture& architecture)
    : schedules_(s) {
  const schedule::ScheduleLimits limits;
  if (s.lattice.respaced_steps != 0) {
    throw InvalidArgument("lattice.respaced_steps",
                          "training uses the full schedule; respacing is a sampling choice");
  }
  lattice_ = WithinPart("lattice", [&] { return schedule::BuildVarianceSchedule(s.lattice, limits); });
  sigma_ = WithinPart("coordinates",
                      [&] { return schedule::BuildSigmaSchedule(s.coordinates, limits); });
  steps_ = static_cast<long long>(lattice_.size());
  if (architecture.species_mode == SpeciesMode::kAbsorbing) {
    schedule::TransitionParams species = s.species;
    species.num_classes = architecture.species_tokens();
    species_ = WithinPart("species",
                          [&] { return schedule::BuildTransitionSchedule(species, limits); });
  } else {
    species_.resize(steps_);
    for (long long t = 0; t < steps_; ++t) species_[t] = {t + 1, 0.0, 1.0};
  }
  if (static_cast<long long>(sigma_.size()) != steps_) {
    throw InvalidArgument("coordinates.steps", "must equal lattice.steps (" +
                                                   std::to_string(steps_) + ")");
  }
  if (static_cast<long long>(species_.size()) != steps_) {
    throw InvalidArgument("species.steps", "must equal lattice.steps (" + std::to_string(steps_) + ")");
  }
  score_scale_ = std::make_unique<std::atomic<double>[]>(static_cast<std::size_t>(steps_));
  for (long long t = 0; t < steps_; ++t) score_scale_[t].store(std::nan(""));
}

double DiffusionProcess::score_scale(long long t) const {
  std::atomic<double>& slot = score_scale_[t - 1];
  double value = slot.load(std::memory_order_relaxed);
  if (std::isnan(value)) {
    const schedule::SigmaLevel& level = sigma_[t - 1];
    value = std::sqrt(WrappedNormalScoreSecondMoment(level.sigma, level.truncation.images));
    slot.store(value, std::memory_order_relaxed);
  }
  return value;
}

double WrappedNormalScoreSecondMoment(double sigma, int images) {
  // Beyond 12 sigma the density is below 1e-31 of its peak: nothing there to integrate.
  const double half_width = std::min(0.5, 12 * sigma);
  const int intervals = 4000;  // even; the integrand is smooth at this resolution for sigma >= 1e-4
  const double h = 2 * half_width / intervals;
  double sum = 0;
  for (int k = 0; k <= intervals; ++k) {
    const double x = -half_width + k * h;
    const double s = schedule::WrappedNormalScore(x, sigma, images);
    const double f = schedule::WrappedNormalDensity(x, sigma, images) * s * s;
    const double weight = (k == 0 || k == intervals) ? 1 : (k % 2 ? 4 : 2);
    sum += weight * f;
  }
  return sum * h / 3;
}

}  // namespace nucleate::model
