// The training loss of a batch and its gradient with respect to the network's outputs
// (core/model/DESIGN.md, "What is diffused"). Each cell weighs the same whatever its size:
//   loss = 1/B sum_c [ w_coordinates / (3 N_c) sum_i |score_i - target_i|^2
//                      + w_lattice / 6 |noise_c - epsilon_c|^2
//                      + w_species / max(1, M_c) sum_{masked i} cross-entropy_i ]
// where the coordinate targets are already divided by the score scale of the cell's sigma and
// made mean-free, and M_c counts the cell's masked atoms.
#pragma once

#include <vector>

#include "core/model/denoiser.h"
#include "core/model/graph_batch.h"

namespace nucleate::train {

template <typename T>
struct BatchTargets {
  model::nn::Matrix<T> coordinate_score;  // atoms x 3
  model::nn::Matrix<T> lattice_noise;     // cells x 6
  std::vector<int> species;               // per atom: vocabulary index to predict, -1 = none
};

struct LossWeights {
  double coordinates = 1.0;
  double lattice = 1.0;
  double species = 1.0;
};

struct LossParts {
  double coordinates = 0, lattice = 0, species = 0;  // each already weighted and averaged
  double total() const { return coordinates + lattice + species; }
};

// Fills d_out (same shapes as out) and returns the parts. InvalidArgument when shapes disagree.
template <typename T>
LossParts BatchLoss(const model::GraphBatch<T>& batch, const model::DenoiserOutput<T>& out,
                    const BatchTargets<T>& targets, const LossWeights& weights,
                    model::DenoiserOutput<T>* d_out);

}  // namespace nucleate::train
