// Denoisers whose exact answer is known, so the samplers are tested apart from any trained model,
// and the small bundles the sampler needs around them.
#pragma once

#include <cmath>
#include <vector>

#include <Eigen/Dense>

#include "core/model/bundle/model_bundle.h"
#include "core/model/diffusion.h"
#include "core/sample/chain.h"
#include "core/schedule/wrapped_normal.h"

namespace nucleate::sample::testing {

// A bundle around an analytic denoiser: the default schedules (T = 1000), identity lattice
// statistics (so the chain's features are the raw features), elements Na and Cl, and a histogram
// in which every cell has `atoms` atoms.
inline model::ModelBundle AnalyticBundle(model::SpeciesMode mode, int atoms = 2) {
  model::ModelBundle b;
  b.architecture.elements = {11, 17};
  b.architecture.species_mode = mode;
  b.schedules = model::DefaultModelSchedules();
  b.atom_counts.overall.assign(atoms + 1, 0);
  b.atom_counts.overall[atoms] = 10;
  return b;
}

// x - round(x): the signed distance on the circle, in [-0.5, 0.5].
inline double CircleDifference(double x) { return x - std::nearbyint(x); }

// Gaussian data: lattice features N(mean, spread^2) per entry, independently; coordinates of atom
// i wrapped normal around centres[i] with width tau per axis. At step t the noised lattice is
// N(sqrt(ab) mean, ab spread^2 + 1 - ab), so the exact noise prediction is
// E[eps | z] = sqrt(1 - ab) (z - sqrt(ab) mean) / (ab spread^2 + 1 - ab); the noised coordinates
// are wrapped normal with width sqrt(tau^2 + sigma_t^2), whose score is exact.
class GaussianDenoiser : public DenoisingFunction {
 public:
  GaussianDenoiser(const model::DiffusionProcess& process, model::LatticeFeatures mean,
                   double spread, std::vector<Eigen::Vector3d> centres, double tau)
      : process_(process), mean_(mean), spread_(spread), centres_(std::move(centres)), tau_(tau) {}

  void Predict(const ChainState& s, long long t, int, Prediction* out) const override {
    const double ab = process_.lattice(t).alpha_bar;
    out->lattice_noise = std::sqrt(1 - ab) * (s.lattice - std::sqrt(ab) * mean_) /
                         (ab * spread_ * spread_ + 1 - ab);
    const double sigma = process_.sigma(t);
    const double width = std::sqrt(tau_ * tau_ + sigma * sigma);
    out->score.resize(static_cast<int>(s.frac.size()), 3);
    for (std::size_t i = 0; i < s.frac.size(); ++i) {
      for (int k = 0; k < 3; ++k) {
        out->score(i, k) =
            schedule::WrappedNormalScore(CircleDifference(s.frac[i][k] - centres_[i][k]), width, 6);
      }
    }
    out->species_logits.resize(0, 0);
  }
  int mask_token() const override { return 2; }

 private:
  const model::DiffusionProcess& process_;
  model::LatticeFeatures mean_;
  double spread_;
  std::vector<Eigen::Vector3d> centres_;
  double tau_;
};

// One structure as the whole data set: the exact noise prediction of the lattice is
// (z - sqrt(ab) x0) / sqrt(1 - ab), the exact coordinate score the wrapped-normal score of the
// displacement from the structure's sites.
class PointDenoiser : public DenoisingFunction {
 public:
  PointDenoiser(const model::DiffusionProcess& process, model::LatticeFeatures clean,
                std::vector<Eigen::Vector3d> sites)
      : process_(process), clean_(clean), sites_(std::move(sites)) {}

  void Predict(const ChainState& s, long long t, int, Prediction* out) const override {
    const double ab = process_.lattice(t).alpha_bar;
    out->lattice_noise = (s.lattice - std::sqrt(ab) * clean_) / std::sqrt(1 - ab);
    const double sigma = process_.sigma(t);
    out->score.resize(static_cast<int>(s.frac.size()), 3);
    for (std::size_t i = 0; i < s.frac.size(); ++i) {
      for (int k = 0; k < 3; ++k) {
        out->score(i, k) = schedule::WrappedNormalScore(
            CircleDifference(s.frac[i][k] - sites_[i][k]), sigma, process_.images(t));
      }
    }
    out->species_logits.resize(0, 0);
  }
  int mask_token() const override { return 2; }

 private:
  const model::DiffusionProcess& process_;
  model::LatticeFeatures clean_;
  std::vector<Eigen::Vector3d> sites_;
};

// Species drawn from fixed probabilities (logits log p), geometry from a point structure: the
// discrete reverse process must reproduce p among generated species.
class FixedSpeciesDenoiser : public PointDenoiser {
 public:
  FixedSpeciesDenoiser(const model::DiffusionProcess& process, model::LatticeFeatures clean,
                       std::vector<Eigen::Vector3d> sites, std::vector<double> probabilities)
      : PointDenoiser(process, clean, std::move(sites)), probabilities_(std::move(probabilities)) {}

  void Predict(const ChainState& s, long long t, int worker, Prediction* out) const override {
    PointDenoiser::Predict(s, t, worker, out);
    out->species_logits.resize(static_cast<int>(s.frac.size()), static_cast<int>(probabilities_.size()));
    for (std::size_t i = 0; i < s.frac.size(); ++i) {
      for (std::size_t e = 0; e < probabilities_.size(); ++e) {
        out->species_logits(i, e) = std::log(probabilities_[e]);
      }
    }
  }

 private:
  std::vector<double> probabilities_;
};

}  // namespace nucleate::sample::testing
