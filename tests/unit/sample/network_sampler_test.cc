// The trained-network sampling path, on a small network with random weights: reproducibility
// across thread counts and request splits, guidance, cancellation, limits and request errors.
// The weights are random, so nothing here judges structures; overfit_sampling_test.cc does.
#include <gtest/gtest.h>

#include <string>
#include <vector>

#include "core/common/error.h"
#include "core/sample/sampler.h"
#include "tests/unit/sample/random_network.h"

namespace nucleate::sample {
namespace {

using testing::RandomNetwork;

SampleJob NaClJob(std::uint32_t first, std::uint32_t count, int threads) {
  SampleJob job;
  job.task = TaskKind::kComposition;
  job.composition.formula = {{11, 1}, {17, 1}};
  job.composition.max_units = 2;
  job.seed = 99;
  job.first_index = first;
  job.count = count;
  job.threads = threads;
  return job;
}

// Bitwise comparison of two candidates.
void ExpectSameBits(const SampleOutcome& a, const SampleOutcome& b) {
  ASSERT_EQ(a.index, b.index);
  ASSERT_TRUE(a.crystal && b.crystal);
  EXPECT_EQ(a.crystal->numbers, b.crystal->numbers) << "sample " << a.index;
  EXPECT_EQ(a.crystal->lattice, b.crystal->lattice) << "sample " << a.index;
  EXPECT_EQ(a.crystal->frac, b.crystal->frac) << "sample " << a.index;
}

TEST(NetworkSampling, ThreadCountsAndRequestSplitsGiveTheSameBits) {
  const model::ModelBundle bundle = RandomNetwork();
  const SampleRun serial = RunSampling(bundle, NaClJob(0, 7, 1));
  ASSERT_EQ(serial.samples.size(), 7u);
  const SampleRun threaded = RunSampling(bundle, NaClJob(0, 7, 3));
  const SampleRun head = RunSampling(bundle, NaClJob(0, 2, 2));
  const SampleRun tail = RunSampling(bundle, NaClJob(2, 5, 1));
  for (std::size_t i = 0; i < 7; ++i) {
    ExpectSameBits(serial.samples[i], threaded.samples[i]);
    ExpectSameBits(serial.samples[i], i < 2 ? head.samples[i] : tail.samples[i - 2]);
  }
  // Formula units are drawn per sample from the histogram (2 or 4 atoms): both occur.
  std::vector<std::size_t> sizes;
  for (const auto& s : serial.samples) sizes.push_back(s.crystal->size());
  EXPECT_NE(std::count(sizes.begin(), sizes.end(), 2u), 0);
  EXPECT_NE(std::count(sizes.begin(), sizes.end(), 4u), 0);
}

TEST(NetworkSampling, EverySamplerIsReproducibleAcrossThreads) {
  const model::ModelBundle bundle = RandomNetwork();
  for (SamplerKind kind : {SamplerKind::kDdim, SamplerKind::kPredictorCorrector,
                           SamplerKind::kProbabilityFlow}) {
    SampleJob job = NaClJob(0, 3, 1);
    job.sampler.kind = kind;
    job.sampler.eta = 0.5;
    const SampleRun one = RunSampling(bundle, job);
    job.threads = 2;
    const SampleRun two = RunSampling(bundle, job);
    for (std::size_t i = 0; i < 3; ++i) ExpectSameBits(one.samples[i], two.samples[i]);
  }
}

TEST(NetworkSampling, GuidanceZeroIsTheUnconditionalSampler) {
  const model::ModelBundle bundle = RandomNetwork();
  const SampleRun unconditional = RunSampling(bundle, NaClJob(0, 3, 2));
  SampleJob job = NaClJob(0, 3, 2);
  job.conditions.crystal_system = 7;
  job.conditions.guidance = 0;
  const SampleRun zero = RunSampling(bundle, job);
  for (std::size_t i = 0; i < 3; ++i) ExpectSameBits(unconditional.samples[i], zero.samples[i]);

  // The condition changes the samples, and a stronger guidance changes them further.
  job.conditions.guidance = 1;
  const SampleRun conditional = RunSampling(bundle, job);
  job.conditions.guidance = 3;
  const SampleRun strong = RunSampling(bundle, job);
  EXPECT_NE(conditional.samples[0].crystal->frac, unconditional.samples[0].crystal->frac);
  EXPECT_NE(strong.samples[0].crystal->frac, conditional.samples[0].crystal->frac);
  EXPECT_EQ(strong.evaluations, 2 * conditional.evaluations) << "guided steps evaluate twice";
}

TEST(NetworkSampling, CancellationReturnsTheFinishedSamples) {
  const model::ModelBundle bundle = RandomNetwork();
  // One thread: groups of 4 samples; 50 steps each. Cancel after the first group's last step.
  int calls = 0;
  const SampleRun run = RunSampling(bundle, NaClJob(0, 10, 1), [&](std::int64_t done, std::int64_t total) {
    EXPECT_EQ(total, 10 * 50);
    ++calls;
    return done < 4 * 50 + 4;
  });
  EXPECT_TRUE(run.cancelled);
  EXPECT_EQ(calls, 4 * 50 + 4);
  ASSERT_EQ(run.samples.size(), 4u);
  const SampleRun full = RunSampling(bundle, NaClJob(0, 4, 1));
  for (std::size_t i = 0; i < 4; ++i) ExpectSameBits(run.samples[i], full.samples[i]);
}

Error ErrorOf(const model::ModelBundle& bundle, const SampleJob& job) {
  try {
    RunSampling(bundle, job);
  } catch (const Error& e) {
    return e;
  }
  ADD_FAILURE() << "no error";
  return Internal("no error");
}

TEST(NetworkSampling, LimitsAreCheckedBeforeAnythingRuns) {
  const model::ModelBundle bundle = RandomNetwork();
  SampleJob job = NaClJob(0, 20, 1);
  job.limits.max_count = 10;
  EXPECT_EQ(ErrorOf(bundle, job).field(), "limits.max_count");
  job = NaClJob(0, 1, 1);
  job.composition.max_units = 200;
  EXPECT_EQ(ErrorOf(bundle, job).field(), "limits.max_atoms");
  job = NaClJob(0, 1, 1);
  job.limits.max_evaluations = 49;
  EXPECT_EQ(ErrorOf(bundle, job).field(), "limits.max_evaluations");
  job = NaClJob(0, 1, 1);
  job.limits.max_memory_bytes = 1000;
  const Error memory = ErrorOf(bundle, job);
  EXPECT_EQ(memory.field(), "limits.max_memory_bytes");
  EXPECT_EQ(memory.kind(), ErrorKind::kLimitExceeded);
}

TEST(NetworkSampling, BadRequestsNameTheField) {
  const model::ModelBundle bundle = RandomNetwork();
  SampleJob job = NaClJob(0, 1, 1);
  job.composition.formula = {{11, 1}, {26, 1}};
  // The formula is one string in a request: the field is the string, the message names Fe.
  EXPECT_EQ(ErrorOf(bundle, job).field(), "composition.formula");
  EXPECT_NE(std::string(ErrorOf(bundle, job).what()).find("Fe (element 26)"), std::string::npos);
  job = NaClJob(0, 1, 1);
  job.task = TaskKind::kDeNovo;
  EXPECT_EQ(ErrorOf(bundle, job).field(), "task") << "a composition-given model cannot";
  job = NaClJob(0, 1, 1);
  job.conditions.space_group = 225;
  EXPECT_EQ(ErrorOf(bundle, job).field(), "conditions.space_group") << "not trained with it";
  job = NaClJob(0, 1, 1);
  job.conditions.properties = {{"band_gap", 1.0}};
  EXPECT_EQ(ErrorOf(bundle, job).field(), "conditions.properties.band_gap");
  job = NaClJob(0, 1, 1);
  job.sampler.steps = 51;
  EXPECT_EQ(ErrorOf(bundle, job).field(), "sampler.steps");
  job = NaClJob(0, 1, 1);
  job.task = TaskKind::kConstrained;
  job.constrained.structure.lattice = Eigen::Matrix3d::Identity() * 4;
  job.constrained.structure.numbers = {11, 17};
  job.constrained.structure.frac = {{0, 0, 0}, {0.5, 0.5, 0.5}};
  job.constrained.fixed_atoms = {0, 2};
  EXPECT_EQ(ErrorOf(bundle, job).field(), "constrained.fixed_atoms[1]");
  job.constrained.fixed_atoms = {0, 1};
  job.constrained.fix_lattice = true;
  EXPECT_EQ(ErrorOf(bundle, job).field(), "constrained") << "nothing left to generate";
}

// Generated species stay within the allowed elements and the mask never leaks into a result.
TEST(NetworkSampling, DeNovoSpeciesComeFromTheAllowedElements) {
  const model::ModelBundle bundle = RandomNetwork(model::SpeciesMode::kAbsorbing);
  SampleJob job;
  job.task = TaskKind::kDeNovo;
  job.de_novo.allowed_elements = {17};
  job.count = 3;
  job.threads = 2;
  for (const SampleOutcome& s : RunSampling(bundle, job).samples) {
    ASSERT_TRUE(s.crystal) << s.error->what();
    for (int z : s.crystal->numbers) EXPECT_EQ(z, 17);
  }
}

}  // namespace
}  // namespace nucleate::sample
