#include "core/train/data/training_statistics.h"

#include <algorithm>
#include <cmath>
#include <set>

#include "core/common/error.h"

namespace nucleate::train::data {
namespace {

void PropertyStatistics(const std::vector<TrainingExample>& examples,
                        const std::vector<std::size_t>& train, std::size_t property,
                        TrainingStatistics& stats) {
  // Two passes: the spread of a property (formation energies near -2 eV/atom spread by 0.01)
  // can be small against its mean.
  std::int64_t count = 0;
  double sum = 0.0;
  for (std::size_t i : train) {
    const double x = examples[i].properties[property];
    if (std::isfinite(x)) {
      sum += x;
      ++count;
    }
  }
  const double mean = count > 0 ? sum / static_cast<double>(count) : 0.0;
  double squares = 0.0;
  for (std::size_t i : train) {
    const double x = examples[i].properties[property];
    if (std::isfinite(x)) squares += (x - mean) * (x - mean);
  }
  const double std = count > 0 ? std::sqrt(squares / static_cast<double>(count)) : 0.0;
  stats.property_mean.push_back(mean);
  stats.property_std.push_back(std > 0.0 ? std : 1.0);
  stats.property_count.push_back(count);
}

}  // namespace

TrainingStatistics ComputeTrainingStatistics(const std::vector<TrainingExample>& examples,
                                             const std::vector<std::size_t>& train) {
  if (train.empty()) throw InvalidArgument("train", "the training split is empty");
  std::size_t properties = 0;
  for (std::size_t k = 0; k < train.size(); ++k) {
    if (train[k] >= examples.size()) {
      throw InvalidArgument("train[" + std::to_string(k) + "]",
                            "index " + std::to_string(train[k]) + " is outside the " +
                                std::to_string(examples.size()) + " examples");
    }
    const TrainingExample& e = examples[train[k]];
    if (k == 0) properties = e.properties.size();
    if (e.properties.size() != properties) {
      throw InvalidArgument("examples[" + std::to_string(train[k]) + "].properties",
                            "holds " + std::to_string(e.properties.size()) + " values, the first "
                            "training example " + std::to_string(properties));
    }
    if (e.crystal_system < 0 || e.crystal_system > 7) {
      throw InvalidArgument("examples[" + std::to_string(train[k]) + "].crystal_system",
                            "must lie in 0..7");
    }
  }

  TrainingStatistics stats;
  stats.cells = static_cast<std::int64_t>(train.size());
  std::vector<model::SizedLattice> cells;
  cells.reserve(train.size());
  std::set<int> elements;
  for (std::size_t i : train) {
    const TrainingExample& e = examples[i];
    cells.push_back({e.crystal.lattice, static_cast<int>(e.crystal.size())});
    stats.max_atoms = std::max<std::int64_t>(stats.max_atoms, e.crystal.size());
    elements.insert(e.crystal.numbers.begin(), e.crystal.numbers.end());
  }
  try {
    stats.lattice = model::ComputeLatticeStatistics(cells);
  } catch (const Error& error) {
    throw error.WithinField("train");  // "train.cells[k]...": the k-th entry of `train`
  }

  stats.atom_counts.assign(static_cast<std::size_t>(stats.max_atoms), 0);
  for (AtomCountHistogram& h : stats.atom_counts_by_crystal_system) {
    h.assign(static_cast<std::size_t>(stats.max_atoms), 0);
  }
  for (std::size_t i : train) {
    const std::size_t n = examples[i].crystal.size();  // >= 1: checked by the lattice statistics
    const auto system = static_cast<std::size_t>(examples[i].crystal_system);
    ++stats.atom_counts[n - 1];
    ++stats.atom_counts_by_crystal_system[system][n - 1];
  }
  for (std::size_t k = 0; k < properties; ++k) PropertyStatistics(examples, train, k, stats);
  stats.elements.assign(elements.begin(), elements.end());
  return stats;
}

}  // namespace nucleate::train::data
