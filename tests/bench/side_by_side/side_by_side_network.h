// nucleate's side of the side-by-side benchmark: the bundle's denoiser run over the benchmark's
// micro-batches exactly as the trainer runs them (core/train/trainer.cc, BatchGradient): one
// micro-batch per worker at a time, per-worker caches reused across calls, micro-batch gradients
// summed in micro-batch order. The optimiser update (clipping, AdamW, moving average) is left
// out: it costs O(parameters), not O(edges), and keeps parity a comparison of gradients.
#pragma once

#include <vector>

#include "core/model/bundle/model_bundle.h"
#include "core/model/denoiser.h"
#include "core/train/loss.h"
#include "tests/bench/side_by_side/side_by_side_batch.h"

namespace nucleate::bench {

class SideBySideNetwork {
 public:
  // `threads` workers (>= 1); the work split (micro-batches) does not depend on it.
  SideBySideNetwork(const model::ModelBundle& bundle, const SideBySideBatch& batch, int threads);

  // One forward pass over every micro-batch; outputs() then holds them per micro-batch.
  void Forward();
  // Forward, loss and backward over every micro-batch; returns the batch loss (mean over cells)
  // and leaves its gradient in gradient() (laid out like the bundle's values).
  train::LossParts Gradient();

  const model::Denoiser& net() const { return net_; }
  const std::vector<model::DenoiserOutput<float>>& outputs() const { return outputs_; }
  const std::vector<float>& gradient() const { return gradient_; }

 private:
  const model::ModelBundle& bundle_;
  const SideBySideBatch& batch_;
  int threads_;
  model::Denoiser net_;
  std::vector<model::DenoiserCache<float>> caches_;             // per worker
  std::vector<model::DenoiserOutput<float>> output_gradients_;  // per worker
  std::vector<model::DenoiserOutput<float>> outputs_;           // per micro-batch
  std::vector<std::vector<float>> micro_gradients_;             // per micro-batch
  std::vector<train::LossParts> micro_losses_;                  // per micro-batch
  std::vector<float> gradient_;
};

}  // namespace nucleate::bench
