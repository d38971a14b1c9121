#include "core/train/training_set.h"

#include <algorithm>
#include <cmath>
#include <limits>

#include "core/common/error.h"
#include "core/model/lattice_features.h"
#include "core/train/data/dataset_hash.h"

namespace nucleate::train {
namespace {

// False when the example holds an element outside the vocabulary.
bool MakeCleanCell(const data::TrainingExample& e, const model::Architecture& a,
                   const data::TrainingStatistics& s, CleanCell* out) {
  const int n = static_cast<int>(e.crystal.size());
  out->frac = e.crystal.frac;
  out->tokens.resize(n);
  std::vector<double> composition(a.elements.size(), 0.0);
  for (int i = 0; i < n; ++i) {
    const int token = a.token_of(e.crystal.numbers[i]);
    if (token < 0) return false;
    out->tokens[i] = token;
    composition[token] += 1.0 / n;
  }
  out->features = s.lattice.Standardise(model::LatticeToFeatures(e.crystal.lattice, n));
  model::CellConditions& k = out->conditions;
  if (a.condition_composition) k.composition = composition;
  if (a.condition_crystal_system) k.crystal_system = e.crystal_system;
  if (a.condition_space_group) k.space_group = e.space_group;
  k.properties.resize(a.properties.size());
  for (std::size_t p = 0; p < a.properties.size(); ++p) {
    const double v = e.properties[p];
    k.properties[p] = std::isnan(v) ? v : (v - s.property_mean[p]) / s.property_std[p];
  }
  return true;
}

}  // namespace

TrainingSet BuildTrainingSet(const std::vector<data::TrainingExample>& examples,
                             const data::DatasetSplit& split, const model::Architecture& settings) {
  if (split.train.empty()) {
    throw InvalidArgument("data", "the training split is empty: every composition fell into "
                                  "validation or test (lower the fractions or add compositions)");
  }
  TrainingSet t;
  t.statistics = data::ComputeTrainingStatistics(examples, split.train);
  t.architecture = settings;
  t.architecture.elements = t.statistics.elements;
  t.dataset_hash = data::DatasetHash(examples, split.train);
  for (std::size_t i : split.train) {
    CleanCell c;
    if (!MakeCleanCell(examples[i], t.architecture, t.statistics, &c)) {
      throw Internal("a training example holds an element missing from the training vocabulary");
    }
    t.train.push_back(std::move(c));
  }
  for (std::size_t i : split.validation) {
    CleanCell c;
    if (MakeCleanCell(examples[i], t.architecture, t.statistics, &c)) {
      t.validation.push_back(std::move(c));
    } else {
      ++t.validation_unscorable;
    }
  }
  t.test_count = static_cast<std::int64_t>(split.test.size());
  return t;
}

model::NormalisationStatistics TrainingSet::Normalisation() const {
  model::NormalisationStatistics n;
  for (int k = 0; k < 6; ++k) {
    n.lattice_mean[k] = statistics.lattice.mean[k];
    n.lattice_std[k] = statistics.lattice.std[k];
  }
  n.property_mean = statistics.property_mean;
  n.property_std = statistics.property_std;
  return n;
}

model::AtomCountHistograms TrainingSet::AtomCounts() const {
  model::AtomCountHistograms h;
  // The bundle indexes histograms by atom count (counts[n] for n atoms, counts[0] = 0); the
  // statistics by n - 1.
  const auto shift = [](const data::AtomCountHistogram& from) {
    std::vector<std::uint64_t> out(from.size() + 1, 0);
    for (std::size_t k = 0; k < from.size(); ++k) out[k + 1] = static_cast<std::uint64_t>(from[k]);
    return out;
  };
  h.overall = shift(statistics.atom_counts);
  for (int system = 1; system <= 7; ++system) {
    h.by_crystal_system[system - 1] = shift(statistics.atom_counts_by_crystal_system[system]);
  }
  return h;
}

}  // namespace nucleate::train
