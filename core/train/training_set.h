// The training data in the network's terms: the vocabulary and statistics from the training
// split, and every usable example of each split as a CleanCell (standardised lattice features,
// vocabulary tokens, standardised properties, full conditions).
#pragma once

#include <cstdint>
#include <string>
#include <vector>

#include "core/model/architecture.h"
#include "core/model/bundle/model_bundle.h"
#include "core/train/data/composition_split.h"
#include "core/train/data/training_example.h"
#include "core/train/data/training_statistics.h"
#include "core/train/noising.h"

namespace nucleate::train {

struct TrainingSet {
  model::Architecture architecture;           // the settings' architecture, vocabulary filled in
  data::TrainingStatistics statistics;        // of the training split
  std::vector<CleanCell> train, validation;   // in split order
  std::int64_t test_count = 0;
  // Validation cells holding an element the training split lacks cannot be scored: counted, left out.
  std::int64_t validation_unscorable = 0;
  std::string dataset_hash;                   // of the training split (data/dataset_hash.h)

  model::NormalisationStatistics Normalisation() const;
  model::AtomCountHistograms AtomCounts() const;
};

// InvalidArgument("data") when the training split is empty (every composition fell into
// validation or test: lower the fractions or add compositions).
TrainingSet BuildTrainingSet(const std::vector<data::TrainingExample>& examples,
                             const data::DatasetSplit& split, const model::Architecture& settings);

}  // namespace nucleate::train
