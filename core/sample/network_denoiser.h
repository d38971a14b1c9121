// The trained network as the samplers' denoising function, with classifier-free guidance (Ho and
// Salimans 2022): with guidance strength w the prediction is u + w (c - u), u unconditional (every
// condition missing) and c conditional. w = 0 is the unconditional model, w = 1 the conditional
// one (each a single evaluation), w > 1 pushes further toward the conditions.
#pragma once

#include <memory>
#include <vector>

#include "core/model/bundle/model_bundle.h"
#include "core/model/denoiser.h"
#include "core/model/diffusion.h"
#include "core/sample/chain.h"

namespace nucleate::sample {

class NetworkDenoiser : public DenoisingFunction {
 public:
  // `bundle` and `process` must outlive this object. `workers` >= 1 scratch sets.
  // InvalidArgument("model") when the bundle's values do not fit its architecture;
  // InvalidArgument("conditions.guidance") for a negative or non-finite strength.
  NetworkDenoiser(const model::ModelBundle& bundle, const model::DiffusionProcess& process,
                  double guidance, int workers);
  ~NetworkDenoiser() override;

  void Predict(const ChainState& state, long long t, int worker, Prediction* out) const override;
  int mask_token() const override { return bundle_.architecture.mask_token(); }

 private:
  struct Workspace;
  void Evaluate(const ChainState& state, bool conditional, long long t, Workspace& w,
                Prediction* out) const;

  const model::ModelBundle& bundle_;
  const model::DiffusionProcess& process_;
  model::Denoiser net_;
  model::LatticeStatistics statistics_;  // the bundle's lattice normalisation
  double guidance_;
  mutable std::vector<std::unique_ptr<Workspace>> workspaces_;
};

}  // namespace nucleate::sample
