#include "core/assess/held_out_split.h"

#include <sstream>

#include "core/common/error.h"
#include "core/train/data/composition_split.h"
#include "core/train/data/dataset_hash.h"
#include "core/train/data/load_dataset.h"

namespace nucleate::assess {
namespace {

std::string Text(double value) {
  std::ostringstream out;
  out << value;
  return out.str();
}

}  // namespace

RebuiltSplit RebuildSplit(const train::TrainSettings& settings, const model::ModelBundle& bundle) {
  const train::data::Dataset dataset = train::data::LoadDataset(settings.data);
  // The call training makes (core/train/trainer.cc); the hash check below catches any drift.
  const train::data::DatasetSplit split =
      train::data::SplitByComposition(dataset.examples, settings.split.validation_fraction,
                                      settings.split.test_fraction, settings.optimisation.seed);
  RebuiltSplit out;
  out.dataset_hash = train::data::DatasetHash(dataset.examples, split.train);
  const std::string& recorded = bundle.provenance.dataset_hash;
  if (!recorded.empty()) {
    if (recorded != out.dataset_hash) {
      throw InvalidArgument(
          "data", "the training split rebuilt from this configuration (SHA-256 " +
                      out.dataset_hash + ") is not the one the model was trained on (" + recorded +
                      "): the data, the split fractions or training.seed differ, so the held-out "
                      "structures would not be the ones the model never saw");
    }
    out.hash_verified = true;
  }
  if (split.test.empty()) {
    throw InvalidArgument("split.test_fraction",
                          "the configuration holds out no test structures (test_fraction " +
                              Text(settings.split.test_fraction) +
                              "): there is nothing the model has not seen to assess it on");
  }
  for (std::size_t i : split.test) out.data.held_out.push_back(dataset.examples[i].crystal);
  for (std::size_t i : split.train) out.data.training.push_back(dataset.examples[i].crystal);
  out.validation_structures = static_cast<std::int64_t>(split.validation.size());
  return out;
}

}  // namespace nucleate::assess
