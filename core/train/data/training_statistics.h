// What a model bundle stores about its training data: normalisation statistics, the atom-count
// histograms that sampling draws N from, and the element vocabulary. All from the training split
// only, so validation and test data never leak into the model.
#pragma once

#include <array>
#include <cstdint>
#include <string>
#include <vector>

#include "core/model/lattice_features.h"
#include "core/train/data/training_example.h"

namespace nucleate::train::data {

// counts[n - 1] = training cells with n atoms, for n = 1..max_atoms.
using AtomCountHistogram = std::vector<std::int64_t>;

struct TrainingStatistics {
  std::int64_t cells = 0;
  model::LatticeStatistics lattice;
  // Per DataSource::property_names, over the cells that have a value. Population std (divided by
  // n). With no value, or zero spread, mean is the value (0 without one) and std is 1:
  // standardising then only shifts, and a requested value off the single training value is not
  // blown up by a tiny divisor.
  std::vector<double> property_mean;
  std::vector<double> property_std;
  std::vector<std::int64_t> property_count;
  std::int64_t max_atoms = 0;  // the largest cell; every histogram has this length
  AtomCountHistogram atom_counts;
  // Index = TrainingExample::crystal_system: 0 (no space group found), 1 triclinic .. 7 cubic.
  std::array<AtomCountHistogram, 8> atom_counts_by_crystal_system;
  std::vector<int> elements;  // atomic numbers present, ascending
};

// InvalidArgument("train") when `train` is empty, "train[k]" for an index outside `examples`,
// "examples[i]..." for inconsistent property counts or a crystal system outside 0..7, and the
// errors of model::ComputeLatticeStatistics as "train.cells[k]..." (k-th entry of `train`) for a
// cell it cannot represent.
TrainingStatistics ComputeTrainingStatistics(const std::vector<TrainingExample>& examples,
                                             const std::vector<std::size_t>& train);

}  // namespace nucleate::train::data
