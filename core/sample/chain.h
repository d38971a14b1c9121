// One sample's state on its way from noise to a structure, what a denoiser predicts for it, and
// the interface every denoiser offers the samplers: the trained network (network_denoiser.h) or
// an analytic one whose exact answer is known (the sampler tests).
#pragma once

#include <vector>

#include <Eigen/Dense>

#include "core/model/lattice_features.h"

namespace nucleate::sample {

// What is known about a sample besides its atoms, as the denoiser sees it; each part may be
// missing. The sampler never changes it.
struct ChainConditions {
  std::vector<double> composition;  // fractions per vocabulary element, empty = missing
  int crystal_system = 0;           // 1..7, 0 = missing
  int space_group = 0;              // 1..230, 0 = missing
  std::vector<double> properties;   // standardised, one per model property; NaN = missing
};

struct ChainState {
  model::LatticeFeatures lattice = model::LatticeFeatures::Zero();  // standardised features
  std::vector<Eigen::Vector3d> frac;  // fractional coordinates in [0, 1)
  std::vector<int> tokens;            // vocabulary index per atom, or the mask token
  ChainConditions conditions;
};

struct Prediction {
  // The score of the fractional coordinates at the level (true scale, not normalised),
  // atoms x 3, mean-free per cell.
  Eigen::Matrix<double, Eigen::Dynamic, 3> score;
  model::LatticeFeatures lattice_noise = model::LatticeFeatures::Zero();  // predicted epsilon
  Eigen::MatrixXd species_logits;  // atoms x elements; empty when species are not generated
};

class DenoisingFunction {
 public:
  virtual ~DenoisingFunction() = default;
  // The prediction for `state` at the model's step t (1..T). `worker` (0 <= worker < the
  // thread count the caller was built for) selects scratch buffers: one thread per worker at a
  // time. Must depend only on (state, t): never on the worker or on other samples.
  virtual void Predict(const ChainState& state, long long t, int worker, Prediction* out) const = 0;
  // The vocabulary's mask token (its index); species_logits has this many columns.
  virtual int mask_token() const = 0;
};

}  // namespace nucleate::sample
