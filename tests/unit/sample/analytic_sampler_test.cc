// The samplers against denoisers whose exact answer is known (analytic_denoisers.h): Gaussian
// data must come back with its mean and variance, a single structure must come back exactly, the
// discrete reverse process must reproduce the predicted species distribution. Expected values
// follow from the definitions of the processes (Ho et al. 2020; Song et al. 2021); tolerances are
// statistical (a stated number of standard errors of the sample size used).
#include <gtest/gtest.h>

#include <chrono>
#include <thread>

#include <algorithm>
#include <cmath>
#include <iostream>
#include <string>
#include <vector>

#include "analytic_denoisers.h"
#include "core/model/lattice_features.h"
#include "core/random/random_stream.h"
#include "core/sample/sampler.h"

namespace nucleate::sample {
namespace {

using testing::AnalyticBundle;
using testing::CircleDifference;

struct SamplerCase {
  std::string name;
  SamplerSettings settings;
};
// Test names in ctest show the case's name, not its bytes.
void PrintTo(const SamplerCase& c, std::ostream* out) { *out << c.name; }

SamplerSettings Make(SamplerKind kind, long long steps, double eta = 0,
                     DdpmVariance variance = DdpmVariance::kPosterior) {
  SamplerSettings s;
  s.kind = kind;
  s.steps = steps;
  s.eta = eta;
  s.ddpm_variance = variance;
  return s;
}

std::vector<SamplerCase> EverySampler() {
  return {
      {"ddpm_posterior", Make(SamplerKind::kDdpm, 0)},
      {"ddpm_forward", Make(SamplerKind::kDdpm, 0, 0, DdpmVariance::kForward)},
      {"ddpm_respaced_100", Make(SamplerKind::kDdpm, 100)},
      {"ddim_eta0", Make(SamplerKind::kDdim, 0)},
      {"ddim_eta1_respaced_200", Make(SamplerKind::kDdim, 200, 1.0)},
      {"ddim_eta0_respaced_50", Make(SamplerKind::kDdim, 50)},
      {"predictor_corrector", Make(SamplerKind::kPredictorCorrector, 0)},
      {"predictor_corrector_respaced_200", Make(SamplerKind::kPredictorCorrector, 200)},
      {"probability_flow_respaced_100", Make(SamplerKind::kProbabilityFlow, 100)},
  };
}

SampleJob CompositionJob(const SamplerSettings& settings, std::uint32_t count) {
  SampleJob job;
  job.task = TaskKind::kComposition;
  job.composition.formula = {{11, 1}, {17, 1}};
  job.sampler = settings;
  job.sampler.lattice_clip = 0;  // the exact predictor needs no clipping; clipping would bias it
  job.seed = 2026;
  job.count = count;
  job.threads = 2;
  return job;
}

// The lattice features of a candidate (identity statistics: the chain's own numbers).
model::LatticeFeatures Features(const structure::Crystal& c) {
  return model::LatticeToFeatures(c.lattice, static_cast<int>(c.size()));
}

struct Moments {
  double mean = 0, variance = 0;
  int n = 0;
};

Moments Of(const std::vector<double>& x) {
  Moments m;
  m.n = static_cast<int>(x.size());
  for (double v : x) m.mean += v / m.n;
  for (double v : x) m.variance += (v - m.mean) * (v - m.mean) / (m.n - 1);
  return m;
}

class GaussianData : public ::testing::TestWithParam<SamplerCase> {};

// Lattice features N(mean, 0.5^2) and coordinates wrapped normal of width 0.05 around two sites:
// the standardised samples (x - mean) / spread, pooled over the six lattice entries (and the six
// coordinates), must have mean 0 and variance 1. With 500 samples, 3000 pooled values: standard
// errors 0.018 (mean) and sqrt(2/3000) = 0.026 (variance); the bounds are 4 of them, plus the
// sampler's own discretisation error at its step count.
TEST_P(GaussianData, MeanAndVarianceMatchTheData) {
  const model::ModelBundle bundle = AnalyticBundle(model::SpeciesMode::kGiven);
  const model::DiffusionProcess process(bundle.schedules, bundle.architecture);
  model::LatticeFeatures mean;
  mean << 0.3, -0.2, 0.1, 0.05, -0.1, 0.2;
  const double spread = 0.5, tau = 0.05;
  const std::vector<Eigen::Vector3d> centres = {{0.1, 0.2, 0.3}, {0.6, 0.7, 0.95}};
  const testing::GaussianDenoiser denoiser(process, mean, spread, centres, tau);
  const SampleRun run = RunSamplingWith(bundle, denoiser, CompositionJob(GetParam().settings, 500));
  ASSERT_EQ(run.samples.size(), 500u);
  std::vector<double> lattice, coordinates;
  for (const SampleOutcome& s : run.samples) {
    ASSERT_TRUE(s.crystal) << s.error->what();
    const model::LatticeFeatures f = Features(*s.crystal);
    for (int k = 0; k < 6; ++k) lattice.push_back((f[k] - mean[k]) / spread);
    for (int i = 0; i < 2; ++i) {
      for (int k = 0; k < 3; ++k) {
        coordinates.push_back(CircleDifference(s.crystal->frac[i][k] - centres[i][k]) / tau);
      }
    }
  }
  const Moments l = Of(lattice), c = Of(coordinates);
  std::cout << GetParam().name << ": standardised lattice mean " << l.mean << " variance "
            << l.variance << "; coordinates mean " << c.mean << " variance " << c.variance
            << " (" << l.n << " values each)\n";
  EXPECT_NEAR(l.mean, 0.0, 4 * 0.018) << "lattice";
  EXPECT_NEAR(l.variance, 1.0, 4 * 0.026 + 0.02) << "lattice";
  EXPECT_NEAR(c.mean, 0.0, 4 * 0.018) << "coordinates";
  EXPECT_NEAR(c.variance, 1.0, 4 * 0.026 + 0.02) << "coordinates";
}

INSTANTIATE_TEST_SUITE_P(EverySampler, GaussianData, ::testing::ValuesIn(EverySampler()),
                         [](const auto& info) { return info.param.name; });

// A denoiser whose second worker is slow (2 ms per prediction): the test below needs that
// worker to finish last. The prediction itself is the wrapped one's, whatever the worker.
class SlowSecondWorker : public DenoisingFunction {
 public:
  explicit SlowSecondWorker(const DenoisingFunction& inner) : inner_(inner) {}
  void Predict(const ChainState& state, long long t, int worker, Prediction* out) const override {
    if (worker == 1) std::this_thread::sleep_for(std::chrono::milliseconds(2));
    inner_.Predict(state, t, worker, out);
  }
  int mask_token() const override { return inner_.mask_token(); }

 private:
  const DenoisingFunction& inner_;
};

// Only the calling thread (worker 0) reports progress. Its first reports take 1 ms each, so
// worker 1 surely takes the second sample; worker 0 then finishes first and waits for worker 1,
// and one report late in worker 1's chain takes 200 ms, during which worker 1 finishes. The reports must still end at the total: a caller's "100 %" line and its last chance
// to cancel depend on it (before the fix this last report was lost: found by the CLI tests under
// load).
TEST(Progress, EndsAtTheTotalWhenAnotherWorkerFinishesLast) {
  const model::ModelBundle bundle = AnalyticBundle(model::SpeciesMode::kGiven);
  const model::DiffusionProcess process(bundle.schedules, bundle.architecture);
  Eigen::Matrix3d lattice;
  lattice << 0, 2.82, 2.82, 2.82, 0, 2.82, 2.82, 2.82, 0;
  const testing::PointDenoiser point(process, model::LatticeToFeatures(lattice, 2),
                                     {{0.0, 0.0, 0.0}, {0.5, 0.5, 0.5}});
  const SlowSecondWorker denoiser(point);
  std::vector<std::int64_t> reports;
  bool waited = false;
  const SampleRun run = RunSamplingWith(
      bundle, denoiser, CompositionJob(Make(SamplerKind::kDdim, 50), 2),
      [&](std::int64_t done, std::int64_t) {
        reports.push_back(done);
        if (done < 50) std::this_thread::sleep_for(std::chrono::milliseconds(1));
        if (done >= 90 && !waited) {
          waited = true;
          std::this_thread::sleep_for(std::chrono::milliseconds(200));
        }
        return true;
      });
  EXPECT_FALSE(run.cancelled);
  EXPECT_TRUE(waited);
  ASSERT_FALSE(reports.empty());
  EXPECT_EQ(reports.back(), 2 * 50);
  for (std::size_t i = 1; i < reports.size(); ++i) EXPECT_LT(reports[i - 1], reports[i]);
}

class SingleStructure : public ::testing::TestWithParam<SamplerCase> {};

// The data set is one structure (rock salt NaCl, primitive cell, a = 5.64 A: from memory): every
// sample must come back to it, within 1e-3 in fractional coordinates (RMS over the sites) and in
// the lattice features.
TEST_P(SingleStructure, SamplesConvergeToIt) {
  const model::ModelBundle bundle = AnalyticBundle(model::SpeciesMode::kGiven);
  const model::DiffusionProcess process(bundle.schedules, bundle.architecture);
  Eigen::Matrix3d lattice;
  lattice << 0, 2.82, 2.82, 2.82, 0, 2.82, 2.82, 2.82, 0;
  const model::LatticeFeatures clean = model::LatticeToFeatures(lattice, 2);
  const std::vector<Eigen::Vector3d> sites = {{0.0, 0.0, 0.0}, {0.5, 0.5, 0.5}};
  const testing::PointDenoiser denoiser(process, clean, sites);
  const SampleRun run = RunSamplingWith(bundle, denoiser, CompositionJob(GetParam().settings, 16));
  ASSERT_EQ(run.samples.size(), 16u);
  double worst_rms = 0, worst_lattice = 0;
  for (const SampleOutcome& s : run.samples) {
    ASSERT_TRUE(s.crystal) << s.error->what();
    double squares = 0;
    for (int i = 0; i < 2; ++i) {
      for (int k = 0; k < 3; ++k) {
        const double d = CircleDifference(s.crystal->frac[i][k] - sites[i][k]);
        squares += d * d;
      }
    }
    const double rms = std::sqrt(squares / 6);
    const double lattice_error = (Features(*s.crystal) - clean).cwiseAbs().maxCoeff();
    EXPECT_LT(rms, 1e-3) << "sample " << s.index;
    EXPECT_LT(lattice_error, 1e-3) << "sample " << s.index;
    worst_rms = std::max(worst_rms, rms);
    worst_lattice = std::max(worst_lattice, lattice_error);
  }
  std::cout << GetParam().name << ": largest fractional RMS " << worst_rms
            << ", largest lattice feature error " << worst_lattice << " (16 samples)\n";
}

INSTANTIATE_TEST_SUITE_P(EverySampler, SingleStructure, ::testing::ValuesIn(EverySampler()),
                         [](const auto& info) { return info.param.name; });

// DDIM with eta = 0 and the probability-flow ODE draw no noise after the prior: for Gaussian data
// their output is the probability-flow map of the prior, which keeps the standardised position
// (z - sqrt(ab) m) / sqrt(ab s^2 + 1 - ab) of a point along the flow (the flow is linear and
// carries one Gaussian marginal to the next). So each sample's lattice must equal
// m + s (z_T - sqrt(ab_T) m) / sqrt(ab_T s^2 + 1 - ab_T), z_T its prior draw, up to the
// discretisation error of the steps (first order for DDIM, second order for Heun's method;
// measured largest deviations over 48 values: DDIM 1000 steps 2.0e-3, Heun 1000 steps 8.7e-5,
// Heun 100 steps 1.1e-2, most of it from the first step, where the cosine schedule's beta is
// clipped at 0.999).
struct DeterministicCase {
  std::string name;
  SamplerSettings settings;
  double tolerance;
};
void PrintTo(const DeterministicCase& c, std::ostream* out) { *out << c.name; }

class Deterministic : public ::testing::TestWithParam<DeterministicCase> {};

TEST_P(Deterministic, OutputIsTheFlowMapOfThePrior) {
  const model::ModelBundle bundle = AnalyticBundle(model::SpeciesMode::kGiven);
  const model::DiffusionProcess process(bundle.schedules, bundle.architecture);
  model::LatticeFeatures mean;
  mean << 0.3, -0.2, 0.1, 0.05, -0.1, 0.2;
  const double spread = 0.5;
  const testing::GaussianDenoiser denoiser(process, mean, spread,
                                           {{0.1, 0.2, 0.3}, {0.6, 0.7, 0.8}}, 0.05);
  const SampleJob job = CompositionJob(GetParam().settings, 8);
  const SampleRun run = RunSamplingWith(bundle, denoiser, job);
  const double ab = process.lattice(process.steps()).alpha_bar;
  double worst = 0;
  for (const SampleOutcome& s : run.samples) {
    random::RandomStream prior(job.seed, s.index, 0, random::Purpose::kSamplePrior);
    const model::LatticeFeatures f = Features(*s.crystal);
    for (int k = 0; k < 6; ++k) {
      const double z = prior.Normal();
      const double expected =
          mean[k] + spread * (z - std::sqrt(ab) * mean[k]) / std::sqrt(ab * spread * spread + 1 - ab);
      EXPECT_NEAR(f[k], expected, GetParam().tolerance) << "sample " << s.index << " entry " << k;
      worst = std::max(worst, std::abs(f[k] - expected));
    }
  }
  std::cout << GetParam().name << ": largest deviation " << worst << "\n";
}

INSTANTIATE_TEST_SUITE_P(
    NoNoiseAfterThePrior, Deterministic,
    ::testing::Values(DeterministicCase{"ddim_eta0", Make(SamplerKind::kDdim, 0), 3e-3},
                      DeterministicCase{"probability_flow", Make(SamplerKind::kProbabilityFlow, 0), 2e-4},
                      DeterministicCase{"probability_flow_respaced_100",
                                        Make(SamplerKind::kProbabilityFlow, 100), 1.5e-2}),
    [](const auto& info) { return info.param.name; });

// De novo generation with species probabilities 0.25 (Na) and 0.75 (Cl) predicted everywhere:
// the revealed species must follow them. 200 cells of 4 atoms: 800 draws, standard error of the
// Na share sqrt(0.25 0.75 / 800) = 0.015; bound 4 of them.
TEST(DiscreteReverseProcess, RevealsSpeciesWithThePredictedProbabilities) {
  const model::ModelBundle bundle = AnalyticBundle(model::SpeciesMode::kAbsorbing, 4);
  const model::DiffusionProcess process(bundle.schedules, bundle.architecture);
  const std::vector<Eigen::Vector3d> sites = {{0, 0, 0}, {0.5, 0.5, 0}, {0.5, 0, 0.5}, {0, 0.5, 0.5}};
  const testing::FixedSpeciesDenoiser denoiser(process, model::LatticeFeatures::Zero(), sites,
                                               {0.25, 0.75});
  SampleJob job;
  job.task = TaskKind::kDeNovo;
  job.sampler.steps = 100;
  job.count = 200;
  job.threads = 2;
  const SampleRun run = RunSamplingWith(bundle, denoiser, job);
  int sodium = 0, total = 0;
  for (const SampleOutcome& s : run.samples) {
    ASSERT_TRUE(s.crystal) << s.error->what();
    ASSERT_EQ(s.crystal->size(), 4u) << "the histogram holds only 4-atom cells";
    for (int z : s.crystal->numbers) {
      sodium += z == 11;
      ++total;
    }
  }
  EXPECT_NEAR(static_cast<double>(sodium) / total, 0.25, 4 * 0.015);

  // Allowed elements restrict the draw: only sodium, although chlorine is more likely.
  job.de_novo.allowed_elements = {11};
  for (const SampleOutcome& s : RunSamplingWith(bundle, denoiser, job).samples) {
    for (int z : s.crystal->numbers) EXPECT_EQ(z, 11);
  }
}

// A variation at low strength starts close to the given structure and, with the structure
// itself as the data, must return to it exactly as a full chain does.
TEST(Variation, ReturnsToTheStructureTheDataHolds) {
  const model::ModelBundle bundle = AnalyticBundle(model::SpeciesMode::kGiven);
  const model::DiffusionProcess process(bundle.schedules, bundle.architecture);
  Eigen::Matrix3d lattice;
  lattice << 0, 2.82, 2.82, 2.82, 0, 2.82, 2.82, 2.82, 0;
  const std::vector<Eigen::Vector3d> sites = {{0.0, 0.0, 0.0}, {0.5, 0.5, 0.5}};
  // The sampler reduces the given cell (Niggli) first; the primitive fcc cell is reduced already
  // up to the choice of basis, so the data is stated in the reduced cell the sampler will use.
  SampleJob job;
  job.task = TaskKind::kVariation;
  job.variation.structure.lattice = lattice;
  job.variation.structure.numbers = {11, 17};
  job.variation.structure.frac = sites;
  job.variation.strength = 0.2;
  job.count = 4;
  const testing::PointDenoiser denoiser(process, model::LatticeToFeatures(lattice, 2), sites);
  for (const SampleOutcome& s : RunSamplingWith(bundle, denoiser, job).samples) {
    ASSERT_TRUE(s.crystal) << s.error->what();
    EXPECT_LT((Features(*s.crystal) - model::LatticeToFeatures(lattice, 2)).cwiseAbs().maxCoeff(), 1e-3);
  }
}

}  // namespace
}  // namespace nucleate::sample
