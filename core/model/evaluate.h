// One denoiser evaluation on caller-given noisy cells: the model's predictions exactly as a
// sampler would use them, for tests, parity checks against other implementations, and users who
// drive their own sampler. Deterministic; no randomness is drawn.
#pragma once

#include <vector>

#include <Eigen/Dense>

#include "core/model/bundle/model_bundle.h"
#include "core/structure/crystal.h"

namespace nucleate::model {

struct EvaluationInput {
  structure::Crystal cell;        // the noisy cell: lattice, species, fractional coordinates
  long long step = 0;             // t in 1..T of the bundle's schedules
  std::vector<bool> masked;       // per atom, or empty: which species are the mask token
  bool composition_known = false; // condition on the cell's own composition
  int crystal_system = 0;         // 0 = missing
  int space_group = 0;            // 0 = missing
  // Raw (not standardised) values by the bundle's property names; absent = missing.
  std::vector<std::pair<std::string, double>> properties;
};

struct EvaluationOutput {
  // The predicted score of the fractional coordinates (network output times the score scale of
  // sigma_t): atoms x 3, mean-free.
  Eigen::Matrix<double, Eigen::Dynamic, 3> coordinate_score;
  Eigen::Matrix<double, 6, 1> lattice_noise;       // predicted epsilon of the lattice features
  Eigen::MatrixXd species_logits;                   // atoms x elements (absorbing models)
};

// InvalidArgument naming "cells[i].<field>": a step outside 1..T, an element outside the model's
// vocabulary, a mask list of the wrong length, a masked atom in a composition-given model, an
// unknown property name, a crystal system or space group out of range.
std::vector<EvaluationOutput> EvaluateModel(const ModelBundle& bundle,
                                            const std::vector<EvaluationInput>& cells);

}  // namespace nucleate::model
