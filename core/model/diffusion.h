// The forward processes of the three diffused parts, as tables over steps t = 1..T, built once from
// the schedules stored in a bundle (core/model/DESIGN.md, "What is diffused"). Training draws noise
// from them; samplers walk them backwards.
#pragma once

#include <atomic>
#include <memory>
#include <vector>

#include "core/model/bundle/model_bundle.h"

namespace nucleate::model {

// The defaults of DESIGN.md: 1000 steps, cosine lattice schedule, geometric sigma 0.005..0.5,
// absorbing species with reciprocal retention.
ModelSchedules DefaultModelSchedules();

class DiffusionProcess {
 public:
  // InvalidArgument naming "lattice.<field>", "coordinates.<field>" or "species.<field>"; the three
  // schedules must have the same number of steps ("coordinates.steps" otherwise).
  // The species schedule is used only by absorbing models (with species_tokens() classes); for a
  // composition-given model every species is always kept.
  DiffusionProcess(const ModelSchedules& schedules, const Architecture& architecture);

  long long steps() const { return steps_; }
  const ModelSchedules& schedules() const { return schedules_; }
  // Step t in 1..steps.
  const schedule::VarianceStep& lattice(long long t) const { return lattice_[t - 1]; }
  double sigma(long long t) const { return sigma_[t - 1].sigma; }
  int images(long long t) const { return sigma_[t - 1].truncation.images; }
  // sqrt(E[s^2]) of the wrapped-normal score s at sigma_t, per coordinate: the network predicts
  // s / score_scale(t). Computed by quadrature on first use of each step and kept (a sampler over
  // 50 respaced steps needs 50 of the 1000): safe to call from several threads, and the value
  // never depends on which thread computed it.
  double score_scale(long long t) const;
  // Probability that an atom's species is still unmasked at step t (absorbing kernel).
  double species_kept(long long t) const { return species_[t - 1].alpha_bar; }

 private:
  ModelSchedules schedules_;
  long long steps_ = 0;
  std::vector<schedule::VarianceStep> lattice_;
  std::vector<schedule::SigmaLevel> sigma_;
  std::vector<schedule::TransitionStep> species_;
  // NaN until computed; std::atomic so concurrent first uses are benign (both store one value).
  std::unique_ptr<std::atomic<double>[]> score_scale_;
};

// E[s(x)^2] for x drawn from the wrapped normal of `sigma` (s its score), by composite Simpson
// quadrature over the part of the circle that carries the mass. Tends to 1/sigma^2 for small sigma.
double WrappedNormalScoreSecondMoment(double sigma, int images);

}  // namespace nucleate::model
