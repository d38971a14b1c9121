// The simplest sampler that uses a trained bundle, for the overfit test only (the product's
// samplers belong to the sampling work): composition given, DDPM ancestral steps for the lattice
// features (Ho et al. 2020, posterior variance) and reverse-SDE Euler-Maruyama steps for the
// fractional coordinates of the variance-exploding wrapped normal (Song et al. 2021):
//   f <- wrap(f + (sigma_t^2 - sigma_{t-1}^2) score + sqrt(sigma_t^2 - sigma_{t-1}^2) z),
// sigma_0 = 0. Randomness from std::mt19937_64: a test fixture, not the product's streams.
#pragma once

#include <algorithm>
#include <cmath>
#include <random>
#include <vector>

#include "core/model/bundle/model_bundle.h"
#include "core/model/denoiser.h"
#include "core/model/diffusion.h"
#include "core/model/graph_batch.h"
#include "core/model/lattice_features.h"
#include "core/structure/crystal.h"

namespace nucleate::train::testing {

inline structure::Crystal ReferenceSample(const model::ModelBundle& b,
                                          const std::vector<int>& numbers, std::uint64_t seed) {
  const model::Denoiser net(b.architecture);
  const model::DiffusionProcess process(b.schedules, b.architecture);
  model::LatticeStatistics statistics;
  for (int k = 0; k < 6; ++k) {
    statistics.mean[k] = b.normalisation.lattice_mean[k];
    statistics.std[k] = b.normalisation.lattice_std[k];
  }
  std::mt19937_64 rng(seed);
  std::normal_distribution<double> normal(0, 1);
  std::uniform_real_distribution<double> uniform(0, 1);
  const int n = static_cast<int>(numbers.size());
  model::NoisyCell cell;
  for (int i = 0; i < n; ++i) {
    cell.frac.emplace_back(uniform(rng), uniform(rng), uniform(rng));
    int token = 0;
    while (b.architecture.elements[token] != numbers[i]) ++token;
    cell.tokens.push_back(token);
  }
  model::LatticeFeatures z;
  for (int k = 0; k < 6; ++k) z[k] = normal(rng);
  for (long long t = process.steps(); t >= 1; --t) {
    for (int k = 0; k < 6; ++k) cell.lattice_features[k] = z[k];
    cell.lattice = model::FeaturesToLattice(statistics.Unstandardise(z), n);
    cell.time = double(t) / double(process.steps());
    const auto batch = model::BuildGraphBatch<float>(b.architecture, {cell});
    model::DenoiserOutput<float> out;
    net.Forward<float>(batch, b.values.data(), &out, nullptr);
    const auto& level = process.lattice(t);
    for (int k = 0; k < 6; ++k) {
      // Through the predicted clean features, clipped to +-5 standard deviations of the training
      // set (the x0 clipping of Ho et al. 2020): near t = T, 1/sqrt(alpha_t) is large and an
      // imperfect epsilon would otherwise throw the cell far outside anything seen.
      const double eps = out.lattice_noise(0, k);
      const double x0 = std::clamp(
          (z[k] - level.sqrt_one_minus_alpha_bar * eps) / level.sqrt_alpha_bar, -5.0, 5.0);
      z[k] = level.posterior_mean_coef_x0 * x0 + level.posterior_mean_coef_xt * z[k];
      if (t > 1) z[k] += std::sqrt(level.posterior_variance) * normal(rng);
    }
    const double s2 = process.sigma(t) * process.sigma(t);
    const double previous2 = t > 1 ? process.sigma(t - 1) * process.sigma(t - 1) : 0.0;
    const double step = s2 - previous2, scale = process.score_scale(t);
    for (int i = 0; i < n; ++i) {
      for (int k = 0; k < 3; ++k) {
        double f = cell.frac[i][k] + step * scale * out.coordinate_score(i, k);
        if (t > 1) f += std::sqrt(step) * normal(rng);
        cell.frac[i][k] = f - std::floor(f);
      }
    }
  }
  structure::Crystal c;
  c.lattice = model::FeaturesToLattice(statistics.Unstandardise(z), n);
  c.numbers = numbers;
  c.frac = cell.frac;
  return c;
}

}  // namespace nucleate::train::testing
