// One training cell at a random time step: the noisy input the network sees and the targets it is
// trained towards (core/model/DESIGN.md, "What is diffused"). Every draw comes from the cell's own
// Philox streams, keyed by (seed, item) with the training step as counter: the same cell at the
// same step is noised identically whatever batch or thread handles it.
#pragma once

#include <cstdint>
#include <vector>

#include <Eigen/Dense>

#include "core/model/architecture.h"
#include "core/model/diffusion.h"
#include "core/model/graph_batch.h"
#include "core/model/lattice_features.h"
#include "core/train/loss.h"

namespace nucleate::train {

// A training example in the network's terms.
struct CleanCell {
  std::vector<Eigen::Vector3d> frac;    // wrapped to [0, 1)
  std::vector<int> tokens;              // vocabulary indices (never the mask token)
  model::LatticeFeatures features;      // standardised clean lattice features
  model::CellConditions conditions;     // everything known; dropout is applied when noising
};

struct ConditionDropout {
  double each = 0.1;  // each condition dropped independently
  double all = 0.1;   // all conditions dropped together (the unconditional score for guidance)
};

struct NoisedCell {
  model::NoisyCell input;
  Eigen::Matrix<double, Eigen::Dynamic, 3> coordinate_target;  // normalised score, mean-free
  model::LatticeFeatures lattice_target;                       // the lattice epsilon
  std::vector<int> species_target;                             // vocabulary index or -1
  long long t = 0;
};

// `fixed_t` > 0 uses that step instead of drawing one (tests, validation at chosen levels).
// Numerical("lattice") if the noisy lattice cannot be represented (not seen with standardised
// features: it needs a draw beyond about 20 standard deviations).
NoisedCell NoiseCell(const CleanCell& cell, const model::DiffusionProcess& process,
                     const model::LatticeStatistics& statistics, const model::Architecture& arch,
                     const ConditionDropout& dropout, std::uint32_t seed, std::uint32_t item,
                     std::uint32_t step, long long fixed_t = 0);

// The loss targets of `noised`, stacked in order as BuildGraphBatch stacks their inputs: atoms
// cell after cell, one lattice row per cell.
BatchTargets<float> StackTargets(const std::vector<NoisedCell>& noised);

}  // namespace nucleate::train
