// The held-out set rebuilt from a training configuration: the test split of the same data, split
// by the same function and settings as training, verified by the model's dataset hash.
#include "core/assess/held_out_split.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <set>

#include "core/structure/composition.h"
#include "core/train/data/composition_split.h"
#include "core/train/data/load_dataset.h"
#include "core/train/train_config.h"
#include "tests/unit/assess/assess_fixture.h"
#include "tests/unit/bundle/bundle_fixture.h"

namespace nucleate::assess {
namespace {

using model::testing::ErrorFrom;

std::string Config(const std::string& seed, const std::string& test_fraction) {
  return R"(data: {directory: structures}
split: {validation_fraction: 0.2, test_fraction: )" +
         test_fraction + R"(}
model: {hidden: 16, layers: 1, time_embedding: 8}
diffusion: {steps: 20}
training: {seed: )" +
         seed + R"(, epochs: 2, batch_size: 2, micro_batch: 1, warmup_steps: 1}
output: {model: model.nucleate}
)";
}

std::multiset<std::string> Labels(const std::vector<structure::Crystal>& cells) {
  std::multiset<std::string> out;
  for (const auto& c : cells) out.insert(c.label);
  return out;
}

class RebuiltSplitTest : public ::testing::Test {
 protected:
  void SetUp() override {
    bundle_ = testing::TrainOn(directory_.path(), testing::IonicCells(), Config("1", "0.3"));
  }
  train::TrainSettings Settings(const std::string& seed, const std::string& test_fraction) const {
    return train::ReadTrainConfig(Config(seed, test_fraction), directory_.path(), "assess.yaml");
  }

  model::testing::TemporaryDirectory directory_;
  model::ModelBundle bundle_;
};

TEST_F(RebuiltSplitTest, HoldsOutTheTestSplitAndKeepsTheTrainingSplitForNovelty) {
  const train::TrainSettings settings = Settings("1", "0.3");
  const RebuiltSplit rebuilt = RebuildSplit(settings, bundle_);
  EXPECT_TRUE(rebuilt.hash_verified);
  EXPECT_EQ(rebuilt.dataset_hash, bundle_.provenance.dataset_hash);

  // The split as training made it (core/train/trainer.cc calls SplitByComposition with these
  // arguments); sources are the CIF file names, e.g. "NaCl.cif".
  const train::data::Dataset dataset = train::data::LoadDataset(settings.data);
  const train::data::DatasetSplit split =
      train::data::SplitByComposition(dataset.examples, 0.2, 0.3, 1);
  ASSERT_FALSE(split.test.empty()) << "choose fractions that hold out a composition";
  ASSERT_FALSE(split.validation.empty()) << "choose fractions that validate a composition";
  std::multiset<std::string> test, train;
  for (std::size_t i : split.test) test.insert(dataset.examples[i].source);
  for (std::size_t i : split.train) train.insert(dataset.examples[i].source);
  EXPECT_EQ(Labels(rebuilt.data.held_out), test);
  EXPECT_EQ(Labels(rebuilt.data.training), train);
  EXPECT_EQ(rebuilt.validation_structures, static_cast<std::int64_t>(split.validation.size()));
  // No held-out composition is among the training structures.
  std::set<std::string> training_formulas;
  for (const auto& c : rebuilt.data.training) {
    training_formulas.insert(structure::ReducedHillFormula(c.numbers));
  }
  for (const auto& c : rebuilt.data.held_out) {
    EXPECT_EQ(training_formulas.count(structure::ReducedHillFormula(c.numbers)), 0u) << c.label;
  }
}

TEST_F(RebuiltSplitTest, RefusesASplitThatIsNotTheModelsOwn) {
  // Another seed sends other compositions to training: the held-out set would include cells the
  // model saw. The first seed whose training split differs is taken.
  const train::data::Dataset dataset = train::data::LoadDataset(Settings("1", "0.3").data);
  const auto train_split = [&](std::uint64_t seed) {
    return train::data::SplitByComposition(dataset.examples, 0.2, 0.3, seed).train;
  };
  std::uint64_t other = 2;
  while (train_split(other) == train_split(1)) ++other;
  const Error e = ErrorFrom([&] { RebuildSplit(Settings(std::to_string(other), "0.3"), bundle_); });
  EXPECT_EQ(e.kind(), ErrorKind::kInvalidArgument);
  EXPECT_EQ(e.field(), "data");
  EXPECT_NE(std::string(e.what()).find(bundle_.provenance.dataset_hash), std::string::npos)
      << e.what();
}

TEST_F(RebuiltSplitTest, RefusesAConfigurationWithoutATestSplit) {
  // Against this model, test_fraction 0 moves the test compositions into training and fails the
  // hash first; a model without a recorded hash reaches the check of the test split.
  model::ModelBundle unrecorded = bundle_;
  unrecorded.provenance.dataset_hash.clear();
  const Error e = ErrorFrom([&] { RebuildSplit(Settings("1", "0.0"), unrecorded); });
  EXPECT_EQ(e.kind(), ErrorKind::kInvalidArgument);
  EXPECT_EQ(e.field(), "split.test_fraction");
  EXPECT_NE(std::string(e.what()).find("test_fraction 0)"), std::string::npos) << e.what();
  EXPECT_EQ(ErrorFrom([&] { RebuildSplit(Settings("1", "0.0"), bundle_); }).field(), "data");
}

TEST_F(RebuiltSplitTest, AModelWithoutARecordedHashIsNotVerified) {
  model::ModelBundle unrecorded = bundle_;
  unrecorded.provenance.dataset_hash.clear();
  const RebuiltSplit rebuilt = RebuildSplit(Settings("1", "0.3"), unrecorded);
  EXPECT_FALSE(rebuilt.hash_verified);
  EXPECT_EQ(rebuilt.dataset_hash, bundle_.provenance.dataset_hash);
}

}  // namespace
}  // namespace nucleate::assess
