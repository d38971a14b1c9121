// The held-out and training structures of a model, rebuilt from its training configuration: the
// same data read the same way and split by composition with the same function and settings as
// training (core/train/trainer.cc), then checked against the dataset hash the model records.
#pragma once

#include <string>

#include "core/assess/assessment.h"
#include "core/model/bundle/model_bundle.h"
#include "core/train/train_settings.h"

namespace nucleate::assess {

struct RebuiltSplit {
  AssessData data;             // held_out = the test split, training = the training split
  std::string dataset_hash;    // of the rebuilt training split (core/train/data/dataset_hash.h)
  bool hash_verified = false;  // false only when the model records no hash to compare with
  std::int64_t validation_structures = 0;  // neither held out here nor used for novelty
};

// Reads settings.data (LoadDataset), splits it with SplitByComposition(examples,
// split.validation_fraction, split.test_fraction, optimisation.seed) and takes the test split as
// held out (Niggli-reduced cells as training saw them, labelled with their sources) and the
// training split for novelty. Errors: those of LoadDataset; InvalidArgument("data") when the
// rebuilt training split's hash differs from bundle.provenance.dataset_hash (other data,
// fractions or seed: the held-out set would not be the one the model never saw), checked first;
// InvalidArgument("split.test_fraction") when the test split is empty.
RebuiltSplit RebuildSplit(const train::TrainSettings& settings, const model::ModelBundle& bundle);

}  // namespace nucleate::assess
