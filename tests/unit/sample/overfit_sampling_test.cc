// The overfit test, sampled with the product's samplers: a model trained on two structures must
// give them back from every sampler and every task, judged by the structure matcher. If this
// fails, nothing larger can work (common practice, no source). Measured figures are printed.
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <string>

#include <gtest/gtest.h>

#include "core/match/structure_matcher.h"
#include "core/model/bundle/bundle_file.h"
#include "core/sample/sampler.h"
#include "core/structure/io/cif_writer.h"
#include "core/train/train_config.h"
#include "core/train/trainer.h"
#include "tests/unit/bundle/bundle_fixture.h"

namespace nucleate::sample {
namespace {

namespace fs = std::filesystem;

// Primitive rock-salt NaCl (fcc, a = 5.64 A) and CsCl (simple cubic, a = 4.12 A): lattice
// constants from memory (handbook values); two atoms each, very different cells.
structure::Crystal NaCl() {
  structure::Crystal c;
  const double h = 5.64 / 2;
  c.lattice << 0, h, h, h, 0, h, h, h, 0;
  c.numbers = {11, 17};
  c.frac = {Eigen::Vector3d(0, 0, 0), Eigen::Vector3d(0.5, 0.5, 0.5)};
  return c;
}
structure::Crystal CsCl() {
  structure::Crystal c;
  c.lattice = Eigen::Matrix3d::Identity() * 4.12;
  c.numbers = {55, 17};
  c.frac = {Eigen::Vector3d(0, 0, 0), Eigen::Vector3d(0.5, 0.5, 0.5)};
  return c;
}

// Trains the two-structure model once per species mode: 3000 steps (6.5 s measured for the
// composition-given model).
model::ModelBundle TrainOverfitModel(const std::string& species) {
  // A folder of this process's own: ctest runs each test in its own process, several at once.
  const model::testing::TemporaryDirectory temporary;
  const fs::path dir = temporary.path();
  fs::create_directories(dir / "structures");
  std::ofstream(dir / "structures" / "NaCl.cif") << structure::io::WriteCifP1(NaCl());
  std::ofstream(dir / "structures" / "CsCl.cif") << structure::io::WriteCifP1(CsCl());
  const train::TrainSettings settings = train::ReadTrainConfig(R"(data: {directory: structures}
split: {validation_fraction: 0.0, test_fraction: 0.0}
model: {hidden: 32, layers: 2, time_embedding: 16, species: )" + species + R"(}
diffusion: {steps: 100}
training:
  epochs: 3000
  batch_size: 2
  micro_batch: 1
  learning_rate: 0.003
  warmup_steps: 50
  ema_decay: 0.99
  condition_dropout: 0.0
  all_conditions_dropout: 0.0
output: {model: model.nucleate}
)", dir.string(), "overfit.yaml");
  const train::TrainResult r = train::Train(settings);
  EXPECT_LT(r.last_loss, 1.0);
  return model::LoadModelBundle((dir / "model.nucleate").string());
}

const model::ModelBundle& GivenSpeciesModel() {
  static const model::ModelBundle bundle = TrainOverfitModel("given");
  return bundle;
}

// How many samples match `target` (or, when it is empty, either training structure).
int Matches(const SampleRun& run, const std::vector<structure::Crystal>& targets,
            const std::string& what) {
  int matched = 0;
  for (const SampleOutcome& s : run.samples) {
    if (!s.crystal) {
      std::printf("%s sample %u failed: %s\n", what.c_str(), s.index, s.error->what());
      continue;
    }
    bool any = false;
    std::string reasons;
    for (const auto& t : targets) {
      const match::MatchResult m = match::MatchStructures(*s.crystal, t, {});
      any = any || m.match;
      reasons += m.reason + "; ";
    }
    matched += any;
    if (!any) {
      std::printf("%s sample %u does not match: %s\n", what.c_str(), s.index, reasons.c_str());
      const auto& c = *s.crystal;
      for (int r = 0; r < 3; ++r) std::printf("  lattice %.4f %.4f %.4f\n", c.lattice(r, 0), c.lattice(r, 1), c.lattice(r, 2));
      for (std::size_t i = 0; i < c.size(); ++i) std::printf("  %d %.4f %.4f %.4f\n", c.numbers[i], c.frac[i][0], c.frac[i][1], c.frac[i][2]);
    }
  }
  std::printf("%s: %d of %zu samples match\n", what.c_str(), matched, run.samples.size());
  return matched;
}

SampleJob Composition(const std::string& which, SamplerKind kind) {
  SampleJob job;
  job.task = TaskKind::kComposition;
  job.composition.formula = {{which == "NaCl" ? 11 : 55, 1}, {17, 1}};
  job.sampler.kind = kind;
  job.seed = 11;
  job.count = 4;
  job.threads = 2;
  return job;
}

struct SamplerName {
  SamplerKind kind;
  const char* name;
};
void PrintTo(const SamplerName& c, std::ostream* out) { *out << c.name; }

class OverfitModel : public ::testing::TestWithParam<SamplerName> {};

// Measured with 3000 training steps: DDPM 8 of 8, predictor-corrector 8 of 8, DDIM (eta 0) 6 of 8,
// probability flow 6 of 8 (the deterministic samplers follow the imperfect model's flow without
// noise to shake them out of a saddle); with 60 training steps every sampler gets 0 of 8, so the
// floor of 6 discriminates.
TEST_P(OverfitModel, StructurePredictionGivesBothStructuresBack) {
  const model::ModelBundle& bundle = GivenSpeciesModel();
  int matched = 0;
  for (const auto& [name, target] : {std::pair{"NaCl", NaCl()}, std::pair{"CsCl", CsCl()}}) {
    const SampleRun run = RunSampling(bundle, Composition(name, GetParam().kind));
    matched += Matches(run, {target}, std::string(GetParam().name) + " " + name);
  }
  EXPECT_GE(matched, 6);
}

INSTANTIATE_TEST_SUITE_P(
    EverySampler, OverfitModel,
    ::testing::Values(SamplerName{SamplerKind::kDdpm, "ddpm"}, SamplerName{SamplerKind::kDdim, "ddim"},
                      SamplerName{SamplerKind::kPredictorCorrector, "predictor_corrector"},
                      SamplerName{SamplerKind::kProbabilityFlow, "probability_flow"}),
    [](const auto& info) { return std::string(info.param.name); });

// A variation of a strained NaCl at strength 0.5 comes back as NaCl. Measured: 4 of 4 (0 of 4
// after 60 training steps).
TEST(OverfitModelTasks, VariationReturnsTheLearnedStructure) {
  SampleJob job;
  job.task = TaskKind::kVariation;
  job.variation.structure = NaCl();
  job.variation.structure.lattice *= 1.04;
  job.variation.structure.frac[1] += Eigen::Vector3d(0.03, -0.02, 0.01);
  job.variation.strength = 0.5;
  job.count = 4;
  job.threads = 2;
  EXPECT_EQ(Matches(RunSampling(GivenSpeciesModel(), job), {NaCl()}, "variation"), 4);
}

// Na fixed at a chosen site and the cell fixed: Cl is placed, Na does not move by a bit, the cell
// is the given one exactly, and the result is rock salt. Measured: 10 of 12 (5 of 12 after 60
// training steps: with Na and the cell given, chance alone places Cl near the right site
// fairly often).
TEST(OverfitModelTasks, ConstrainedGenerationKeepsTheFixedPartsExactly) {
  SampleJob job;
  job.task = TaskKind::kConstrained;
  job.constrained.structure = NaCl();
  job.constrained.structure.frac[0] = Eigen::Vector3d(0.125, 0.25, 0.375);
  job.constrained.structure.frac[1] = Eigen::Vector3d(0.625, 0.75, 0.875);
  job.constrained.fixed_atoms = {0};
  job.constrained.fix_lattice = true;
  job.count = 12;
  job.threads = 2;
  const SampleRun run = RunSampling(GivenSpeciesModel(), job);
  for (const SampleOutcome& s : run.samples) {
    ASSERT_TRUE(s.crystal);
    EXPECT_EQ(s.crystal->frac[0], job.constrained.structure.frac[0]) << "the fixed atom moved";
    EXPECT_EQ(s.crystal->lattice, job.constrained.structure.lattice) << "the fixed cell changed";
  }
  EXPECT_GE(Matches(run, {NaCl()}, "constrained"), 9);
}

// De novo generation with a model that generates species: each sample is one of the two learned
// structures, species included. Measured: 7 of 8 (0 of 8 after 60 training steps).
TEST(OverfitModelTasks, DeNovoGenerationGivesLearnedStructures) {
  const model::ModelBundle bundle = TrainOverfitModel("absorbing");
  SampleJob job;
  job.task = TaskKind::kDeNovo;
  job.count = 8;
  job.threads = 2;
  job.seed = 3;
  EXPECT_GE(Matches(RunSampling(bundle, job), {NaCl(), CsCl()}, "de novo"), 6);
}

}  // namespace
}  // namespace nucleate::sample
