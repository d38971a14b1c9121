// The hand-written backward pass of the whole denoiser and of the training loss, against central
// finite differences in double precision, for every parameter (the numerical check is common
// practice, no source).
#include <cmath>
#include <vector>

#include <gtest/gtest.h>

#include "core/model/denoiser.h"
#include "core/model/nn/parameters.h"
#include "core/train/loss.h"
#include "tests/unit/model/model_test_support.h"

namespace nucleate::model {
namespace {

using nn::Matrix;

struct Problem {
  Architecture architecture = testing::TinyArchitecture();
  Denoiser denoiser{architecture};
  GraphBatch<double> batch;
  train::BatchTargets<double> targets;

  Problem() {
    // Cells of 2, 3 (all pairs) and 6 atoms (cutoff neighbours); one with missing conditions.
    std::vector<NoisyCell> cells = {testing::RandomCell(architecture, 2, 1, false),
                                    testing::RandomCell(architecture, 3, 2, true),
                                    testing::RandomCell(architecture, 6, 3, false)};
    batch = BuildGraphBatch<double>(architecture, cells);
    std::mt19937_64 rng(9);
    std::normal_distribution<double> n(0, 1);
    targets.coordinate_score.resize(batch.atoms(), 3);
    for (int i = 0; i < batch.atoms(); ++i)
      for (int k = 0; k < 3; ++k) targets.coordinate_score(i, k) = n(rng);
    targets.lattice_noise.resize(batch.cells, 6);
    for (int c = 0; c < batch.cells; ++c)
      for (int k = 0; k < 6; ++k) targets.lattice_noise(c, k) = n(rng);
    for (int i = 0; i < batch.atoms(); ++i) {
      targets.species.push_back(i % 3 == 1 ? -1 : static_cast<int>(rng() % 3));
    }
  }

  double Loss(const std::vector<double>& w) const {
    DenoiserOutput<double> out, d;
    denoiser.Forward<double>(batch, w.data(), &out, nullptr);
    return train::BatchLoss(batch, out, targets, train::LossWeights{}, &d).total();
  }

  std::vector<double> Gradient(const std::vector<double>& w) const {
    DenoiserOutput<double> out, d;
    DenoiserCache<double> cache;
    denoiser.Forward(batch, w.data(), &out, &cache);
    train::BatchLoss(batch, out, targets, train::LossWeights{}, &d);
    std::vector<double> g(w.size(), 0.0);
    denoiser.Backward(batch, w.data(), cache, d, g.data());
    return g;
  }
};

TEST(DenoiserGradient, EveryParameterMatchesFiniteDifferences) {
  Problem p;
  ASSERT_GT(p.batch.edges(), 0);
  // The 6-atom cell uses cutoff neighbours: its edge count is not 6 * 5 in general.
  std::vector<double> w = nn::Initialise<double>(p.denoiser.layout(), 7);
  // Non-trivial gains, shifts and biases so no gradient vanishes by symmetry of the start point.
  std::mt19937_64 rng(11);
  std::uniform_real_distribution<double> jitter(-0.3, 0.3);
  for (double& v : w) v += jitter(rng);
  const std::vector<double> g = p.Gradient(w);
  const double h = 1e-6;
  int checked = 0;
  for (const auto& tensor : p.denoiser.layout().tensors()) {
    // Every tensor takes part in the loss: an all-zero gradient would make the check vacuous.
    double largest = 0;
    for (std::size_t k = 0; k < tensor.size(); ++k) largest = std::max(largest, std::abs(g[tensor.offset + k]));
    // Except the coordinate head's bias: the same offset on every atom is removed with the mean
    // (translation invariance), so its gradient is zero by design.
    if (tensor.name == "head.coordinate.out.bias") {
      EXPECT_LT(largest, 1e-12);
    } else {
      EXPECT_GT(largest, 1e-8) << tensor.name;
    }
    for (std::size_t k = 0; k < tensor.size(); ++k) {
      const std::size_t i = tensor.offset + k;
      std::vector<double> plus = w, minus = w;
      plus[i] += h;
      minus[i] -= h;
      const double numeric = (p.Loss(plus) - p.Loss(minus)) / (2 * h);
      // Central differences leave an error of order h^2 * f''' plus rounding of order eps/h.
      EXPECT_NEAR(g[i], numeric, 1e-6 * std::max(1.0, std::abs(numeric)))
          << tensor.name << "[" << k << "]";
      ++checked;
    }
  }
  EXPECT_EQ(checked, static_cast<int>(p.denoiser.layout().size()));
}

TEST(DenoiserGradient, BackwardAccumulates) {
  Problem p;
  const std::vector<double> w = nn::Initialise<double>(p.denoiser.layout(), 3);
  const std::vector<double> once = p.Gradient(w);
  DenoiserOutput<double> out, d;
  DenoiserCache<double> cache;
  p.denoiser.Forward(p.batch, w.data(), &out, &cache);
  train::BatchLoss(p.batch, out, p.targets, train::LossWeights{}, &d);
  std::vector<double> twice(w.size(), 0.0);
  p.denoiser.Backward(p.batch, w.data(), cache, d, twice.data());
  p.denoiser.Backward(p.batch, w.data(), cache, d, twice.data());
  for (std::size_t i = 0; i < w.size(); ++i) EXPECT_DOUBLE_EQ(twice[i], 2 * once[i]);
}

}  // namespace
}  // namespace nucleate::model
