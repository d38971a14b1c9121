// The one batch the side-by-side benchmark runs: 64 cells of 20 atoms with invented compositions
// over the model's own vocabulary, noised once as a training step would noise them (time step,
// coordinate and lattice noise, species masks, condition dropout all drawn from nucleate's own
// Philox streams with a fixed seed), then laid out for the network. Everything is deterministic:
// the same bundle gives the same batch, bit for bit, on every run.
#pragma once

#include <vector>

#include "core/model/bundle/model_bundle.h"
#include "core/model/graph_batch.h"
#include "core/model/lattice_features.h"
#include "core/train/loss.h"
#include "core/train/noising.h"

namespace nucleate::bench {

inline constexpr int kBatchCells = 64;
inline constexpr int kAtomsPerCell = 20;
// Cells per micro-batch, as the trainer splits a batch (train_settings.h default, and the demo
// model's training configuration).
inline constexpr int kMicroBatchCells = 8;

struct SideBySideBatch {
  std::vector<train::CleanCell> clean;    // per cell, before noising
  std::vector<train::NoisedCell> noised;  // per cell: noisy input, targets, time step
  // The coordinate noise drawn for each atom, sigma_t eps (atoms x 3), and sigma_t per cell:
  // the noisy coordinates are wrap(clean + displacement), checked when the batch is built.
  Eigen::Matrix<double, Eigen::Dynamic, 3, Eigen::RowMajor> coordinate_displacement;
  std::vector<double> sigma;
  // All 64 cells as one graph batch: what the dump describes and what the PyTorch side runs.
  model::GraphBatch<float> whole;
  train::BatchTargets<float> whole_targets;
  // The same cells cut into micro-batches of kMicroBatchCells, as nucleate's trainer runs them.
  std::vector<model::GraphBatch<float>> micro;
  std::vector<train::BatchTargets<float>> micro_targets;
};

// InvalidArgument("architecture.elements") when the vocabulary has fewer than 3 elements;
// Internal when the coordinate draws replayed here do not reproduce train::NoiseCell's.
SideBySideBatch BuildSideBySideBatch(const model::ModelBundle& bundle);

}  // namespace nucleate::bench
