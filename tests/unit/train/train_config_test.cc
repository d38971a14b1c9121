// The training configuration reader: defaults, paths, and errors that name the key and line.
#include <gtest/gtest.h>

#include "core/common/error.h"
#include "core/train/train_config.h"
#include "tests/unit/train/config_test_support.h"

namespace nucleate::train {
namespace {

using testing::kMinimal;
using testing::MessageOf;

TEST(TrainConfig, MinimalFileTakesDefaultsAndResolvesPaths) {
  const TrainSettings s = ReadTrainConfig(kMinimal, "/runs/a", "train.yaml");
  EXPECT_EQ(s.data.directory, "/runs/a/structures");
  EXPECT_EQ(s.output.model, "/runs/a/out/model.nucleate");
  EXPECT_EQ(s.architecture.hidden, 128);
  EXPECT_EQ(s.optimisation.batch_size, 64);
  EXPECT_EQ(s.diffusion.lattice.steps, 1000);
  EXPECT_EQ(s.yaml, kMinimal);
}

TEST(TrainConfig, ReadsEverySection) {
  const TrainSettings s = ReadTrainConfig(R"(data:
  structure_set: /data/set.pb
  properties: [band_gap]
  symprec: 0.05
split: {validation_fraction: 0.2, test_fraction: 0.0}
model:
  hidden: 32
  layers: 2
  species: absorbing
  conditions: [composition, crystal_system]
diffusion: {steps: 200, lattice_schedule: linear, sigma_min: 0.01, sigma_max: 0.4}
training:
  seed: 7
  epochs: 3
  learning_rate: 0.002
  loss_weights: {species: 0.5}
  threads: 2
output: {model: m.nucleate, checkpoint: c.ckpt, resume: true}
)", "/w", "t.yaml");
  EXPECT_EQ(s.data.structure_set_file, "/data/set.pb");
  EXPECT_EQ(s.architecture.properties, std::vector<std::string>{"band_gap"});
  EXPECT_DOUBLE_EQ(s.split.validation_fraction, 0.2);
  EXPECT_EQ(s.architecture.species_mode, model::SpeciesMode::kAbsorbing);
  EXPECT_TRUE(s.architecture.condition_composition);
  EXPECT_FALSE(s.architecture.condition_space_group);
  EXPECT_EQ(s.diffusion.coordinates.steps, 200);
  EXPECT_EQ(s.diffusion.species.steps, 200);
  EXPECT_EQ(s.diffusion.lattice.kind, schedule::VarianceKind::kLinear);
  EXPECT_EQ(s.optimisation.seed, 7u);
  EXPECT_DOUBLE_EQ(s.optimisation.loss_weights.species, 0.5);
  EXPECT_DOUBLE_EQ(s.optimisation.loss_weights.lattice, 1.0);
  EXPECT_TRUE(s.output.resume);
  EXPECT_EQ(s.output.checkpoint, "/w/c.ckpt");
}

TEST(TrainConfig, UnknownKeyIsNamedWithItsLine) {
  const std::string e = MessageOf(std::string(kMinimal) + "training:\n  batch_sise: 12\n");
  EXPECT_NE(e.find("train.yaml:6: training.batch_sise"), std::string::npos) << e;
  EXPECT_NE(e.find("unknown key"), std::string::npos) << e;
}

TEST(TrainConfig, UnknownSectionIsNamed) {
  const std::string e = MessageOf(std::string(kMinimal) + "sampling: {steps: 3}\n");
  EXPECT_NE(e.find("sampling"), std::string::npos) << e;
  EXPECT_NE(e.find("unknown key"), std::string::npos) << e;
}

TEST(TrainConfig, WrongTypeAndRangeAreNamed) {
  std::string e = MessageOf(std::string(kMinimal) + "model:\n  hidden: wide\n");
  EXPECT_NE(e.find("model.hidden"), std::string::npos) << e;
  EXPECT_NE(e.find("'wide'"), std::string::npos) << e;
  e = MessageOf(std::string(kMinimal) + "training:\n  batch_size: 0\n");
  EXPECT_NE(e.find("training.batch_size"), std::string::npos) << e;
  e = MessageOf(std::string(kMinimal) + "model:\n  conditions: [colour]\n");
  EXPECT_NE(e.find("unknown condition 'colour'"), std::string::npos) << e;
  e = MessageOf(std::string(kMinimal) + "split: {validation_fraction: 0.6, test_fraction: 0.5}\n");
  EXPECT_NE(e.find("split.test_fraction"), std::string::npos) << e;
}

TEST(TrainConfig, MissingSectionsAndBadYaml) {
  EXPECT_NE(MessageOf("output: {model: m}\n").find("data"), std::string::npos);
  EXPECT_NE(MessageOf("data: {directory: d}\n").find("output"), std::string::npos);
  EXPECT_NE(MessageOf("data: {directory: d, structure_set: s}\noutput: {model: m}\n")
                .find("exactly one"),
            std::string::npos);
  EXPECT_NE(MessageOf("data: [\n").find("not valid YAML"), std::string::npos);
}

}  // namespace
}  // namespace nucleate::train
