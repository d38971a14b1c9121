#include "core/sample/reverse_step.h"

#include <algorithm>
#include <cmath>
#include <limits>

namespace nucleate::sample {
namespace {

using model::LatticeFeatures;
using random::Purpose;
using random::RandomStream;

double Wrap(double f) {
  f -= std::floor(f);
  return f >= 1.0 ? 0.0 : f;  // f just below 0 rounds to 1.0 after adding 1
}

// The clean lattice features implied by a noise prediction, clipped, and the noise that agrees
// with the clipped value (so every sampler moves toward the same clipped estimate).
void CleanLatticeEstimate(double clip, double alpha_bar, const LatticeFeatures& z,
                          const LatticeFeatures& eps, LatticeFeatures* x0, LatticeFeatures* eps_out) {
  const double a = std::sqrt(alpha_bar), b = std::sqrt(1 - alpha_bar);
  // alpha_bar = 0 (a zero-terminal-SNR schedule at T) gives no estimate; the clip bounds it.
  *x0 = (z - b * eps) / std::max(a, std::numeric_limits<double>::min());
  if (clip > 0) *x0 = x0->cwiseMax(-clip).cwiseMin(clip);
  *eps_out = b > 0 ? LatticeFeatures((z - a * *x0) / b) : eps;
}

// DDIM (Song, Meng and Ermon 2021, eq. 12) from alpha_bar to alpha_bar_next with noise `noise`.
LatticeFeatures DdimLattice(double eta, double alpha_bar, double alpha_bar_next,
                            const LatticeFeatures& x0, const LatticeFeatures& eps,
                            const LatticeFeatures& noise) {
  const double spread = eta * std::sqrt((1 - alpha_bar_next) / (1 - alpha_bar) *
                                        (1 - alpha_bar / alpha_bar_next));
  return std::sqrt(alpha_bar_next) * x0 +
         std::sqrt(std::max(0.0, 1 - alpha_bar_next - spread * spread)) * eps + spread * noise;
}

// The lattice part of a predictor step. `last`: the step to the clean structure adds no noise.
LatticeFeatures LatticePredictor(const SamplerSettings& s, const ReverseLevel& level, bool last,
                                 const LatticeFeatures& z, const LatticeFeatures& predicted,
                                 const LatticeFeatures& noise) {
  const schedule::VarianceStep& v = level.lattice;
  LatticeFeatures x0, eps;
  CleanLatticeEstimate(s.lattice_clip, v.alpha_bar, z, predicted, &x0, &eps);
  const double beta = v.beta;
  switch (s.kind) {
    case SamplerKind::kDdpm: {
      const LatticeFeatures mean = v.posterior_mean_coef_x0 * x0 + v.posterior_mean_coef_xt * z;
      const double variance =
          s.ddpm_variance == DdpmVariance::kPosterior ? v.posterior_variance : beta;
      return last ? mean : LatticeFeatures(mean + std::sqrt(variance) * noise);
    }
    case SamplerKind::kDdim:
      return DdimLattice(last ? 0.0 : s.eta, v.alpha_bar, level.alpha_bar_next, x0, eps, noise);
    case SamplerKind::kPredictorCorrector: {
      // Reverse-SDE predictor of the variance-preserving SDE (Song et al. 2021, eq. 47), with
      // the exact 1/sqrt(1 - beta) in place of its first-order form 2 - sqrt(1 - beta).
      const LatticeFeatures score = -eps / std::sqrt(1 - v.alpha_bar);
      const LatticeFeatures mean = (z + beta * score) / std::sqrt(1 - beta);
      return last ? mean : LatticeFeatures(mean + std::sqrt(beta) * noise);
    }
    case SamplerKind::kProbabilityFlow:
      // Euler step of the probability-flow ODE in (z / sqrt(alpha_bar), sqrt((1 - alpha_bar) /
      // alpha_bar)), which is DDIM with eta = 0 (Song, Meng and Ermon 2021, sec. 4.3); Heun's
      // correction follows in ReverseStep.
      return DdimLattice(0.0, v.alpha_bar, level.alpha_bar_next, x0, eps, noise);
  }
  return z;
}

// The coordinate part of a predictor step on the torus (variance exploding, sigma -> sigma_next).
void CoordinatePredictor(const SamplerSettings& s, const ReverseLevel& level, bool last,
                         const Eigen::Matrix<double, Eigen::Dynamic, 3>& score,
                         const std::vector<double>& noise, std::vector<Eigen::Vector3d>* frac) {
  const double s2 = level.sigma * level.sigma, n2 = level.sigma_next * level.sigma_next;
  const double drop = s2 - n2;                 // sigma_t^2 - sigma_next^2
  const double posterior = n2 * drop / s2;     // variance of the ancestral step
  double drift = drop, spread = 0;
  switch (s.kind) {
    case SamplerKind::kDdpm:
      // Ancestral sampling of the variance-exploding chain (Song et al. 2021, appendix F).
      spread = std::sqrt(s.ddpm_variance == DdpmVariance::kPosterior ? posterior : drop);
      break;
    case SamplerKind::kDdim: {
      // DDIM on the variance-exploding chain: x0 = f + sigma^2 score, eps = -sigma score,
      // f' = x0 + sqrt(sigma_next^2 - c^2) eps + c z with c = eta sqrt(posterior); eta = 1 is the
      // ancestral step.
      spread = s.eta * std::sqrt(posterior);
      drift = s2 - std::sqrt(std::max(0.0, n2 - spread * spread)) * level.sigma;
      break;
    }
    case SamplerKind::kPredictorCorrector:
      spread = std::sqrt(drop);  // reverse-SDE predictor (Song et al. 2021, Algorithm 2)
      break;
    case SamplerKind::kProbabilityFlow:
      // Euler step of dx/dsigma = -sigma score: x += (sigma - sigma_next) sigma score.
      drift = (level.sigma - level.sigma_next) * level.sigma;
      break;
  }
  if (last) spread = 0;
  for (std::size_t i = 0; i < frac->size(); ++i) {
    for (int k = 0; k < 3; ++k) {
      (*frac)[i][k] = Wrap((*frac)[i][k] + drift * score(i, k) + spread * noise[3 * i + k]);
    }
  }
}

// Masked atoms are revealed with probability (kept_next - kept) / (1 - kept), the reverse of the
// absorbing kernel (Austin et al. 2021), their species drawn from the predicted distribution
// over the allowed elements. The last step reveals every atom.
void SpeciesStep(const ReverseLevel& level, bool last, const Eigen::MatrixXd& logits,
                 const ChainConstraints& c, int mask_token, RandomStream& draws,
                 std::vector<int>* tokens) {
  const double reveal =
      last || level.kept >= 1 ? 1.0 : (level.kept_next - level.kept) / (1 - level.kept);
  for (std::size_t i = 0; i < tokens->size(); ++i) {
    if ((*tokens)[i] != mask_token) continue;
    const double u = draws.Uniform(), pick = draws.Uniform();
    if (u >= reveal || logits.rows() == 0) continue;
    double top = -std::numeric_limits<double>::infinity();
    for (int e = 0; e < mask_token; ++e) {
      if (c.allowed_elements.empty() || c.allowed_elements[e]) top = std::max(top, logits(i, e));
    }
    double total = 0;
    std::vector<double> weight(mask_token, 0.0);
    for (int e = 0; e < mask_token; ++e) {
      if (c.allowed_elements.empty() || c.allowed_elements[e]) {
        weight[e] = std::exp(logits(i, e) - top);
        total += weight[e];
      }
    }
    double cumulative = 0;
    int chosen = -1;
    for (int e = 0; e < mask_token; ++e) {
      if (weight[e] <= 0) continue;
      chosen = e;  // the last allowed element takes what rounding leaves over
      cumulative += weight[e] / total;
      if (pick < cumulative) break;
    }
    if (chosen >= 0) (*tokens)[i] = chosen;
  }
}

// One Langevin corrector step at `level` (Song et al. 2021, Algorithms 4 and 5):
// x += eps score + sqrt(2 eps) z with the step eps = 2 alpha (snr |z| / |score|)^2 chosen for a
// target signal-to-noise ratio. Both norms are taken at their expected values, not as drawn:
// |z|^2 = d and |score|^2 = d E[s^2], with E[s^2] = score_scale^2 for the coordinates (the
// second moment of the wrapped-normal score at sigma) and 1 / (1 - alpha_bar) for the lattice.
// A cell has few dimensions (6 lattice numbers, 3N coordinates) where the drawn norms vary a
// lot: with them the step grows with the very noise it injects and explodes where the score
// happens to be small, which inflated the variance of Gaussian data 1.88-fold at snr 0.16 and
// 1000 steps (1.27-fold with the noise norm alone replaced, at snr 0.05). The paper's images have
// thousands of dimensions, where the norms barely vary and both rules agree.
void CorrectorStep(const SamplerSettings& s, const ReverseLevel& level, const Prediction& p,
                   RandomStream& noise, ChainState* state) {
  LatticeFeatures z;
  for (int k = 0; k < 6; ++k) z[k] = noise.Normal();
  const double one_minus = 1 - level.lattice.alpha_bar;
  const LatticeFeatures score = -p.lattice_noise / std::sqrt(one_minus);
  const double lattice_step = 2 * level.lattice.alpha * s.snr * s.snr * one_minus;
  state->lattice += lattice_step * score + std::sqrt(2 * lattice_step) * z;

  const double step = 2 * s.snr * s.snr / (level.score_scale * level.score_scale);
  for (std::size_t i = 0; i < state->frac.size(); ++i) {
    for (int k = 0; k < 3; ++k) {
      state->frac[i][k] =
          Wrap(state->frac[i][k] + step * p.score(i, k) + std::sqrt(2 * step) * noise.Normal());
    }
  }
}

}  // namespace

void ImposeConstraints(const ChainConstraints& c, double alpha_bar, double sigma, double kept,
                       SampleKey key, long long step, int mask_token, ChainState* state) {
  RandomStream noise(key.seed, key.index, static_cast<std::uint32_t>(step),
                     Purpose::kSampleConstraint);
  if (c.fixed_lattice) {
    LatticeFeatures z;
    for (int k = 0; k < 6; ++k) z[k] = noise.Normal();
    state->lattice = std::sqrt(alpha_bar) * c.clean_lattice + std::sqrt(1 - alpha_bar) * z;
  }
  for (std::size_t i = 0; i < c.fixed_atom.size(); ++i) {
    if (!c.fixed_atom[i]) continue;
    for (int k = 0; k < 3; ++k) {
      const double displacement = sigma * noise.Normal();
      state->frac[i][k] = sigma > 0 ? Wrap(c.clean_frac[i][k] + displacement) : c.clean_frac[i][k];
    }
  }
  for (std::size_t i = 0; i < c.known_species.size(); ++i) {
    if (!c.known_species[i]) continue;
    const double u = noise.Uniform();
    state->tokens[i] = u < kept ? c.clean_tokens[i] : mask_token;
  }
}

void ReverseStep(const DenoisingFunction& denoiser, const SamplerSettings& s,
                 const std::vector<ReverseLevel>& levels, std::size_t k,
                 const ChainConstraints& c, SampleKey key, int worker, Prediction* p,
                 ChainState* state) {
  const ReverseLevel& level = levels[k];
  const bool last = k + 1 == levels.size();
  const auto step = static_cast<std::uint32_t>(level.t);
  denoiser.Predict(*state, level.t, worker, p);

  // Noise of the step: 6 lattice numbers, then 3 per atom, drawn whether the sampler uses them or
  // not, so the stream layout is the same for every sampler.
  RandomStream noise(key.seed, key.index, step, Purpose::kSampleStep);
  LatticeFeatures lattice_noise;
  for (int j = 0; j < 6; ++j) lattice_noise[j] = noise.Normal();
  std::vector<double> coordinate_noise(3 * state->frac.size());
  for (double& x : coordinate_noise) x = noise.Normal();

  const ChainState before = s.kind == SamplerKind::kProbabilityFlow && !last ? *state : ChainState{};
  const LatticeFeatures first_noise = p->lattice_noise;
  const Eigen::Matrix<double, Eigen::Dynamic, 3> first_score = p->score;

  state->lattice = LatticePredictor(s, level, last, state->lattice, p->lattice_noise, lattice_noise);
  CoordinatePredictor(s, level, last, p->score, coordinate_noise, &state->frac);
  RandomStream species(key.seed, key.index, step, Purpose::kSampleSpecies);
  SpeciesStep(level, last, p->species_logits, c, denoiser.mask_token(), species, &state->tokens);
  if (last) {
    ImposeConstraints(c, 1.0, 0.0, 1.0, key, 0, denoiser.mask_token(), state);
    return;
  }
  const ReverseLevel& next = levels[k + 1];
  ImposeConstraints(c, next.lattice.alpha_bar, next.sigma, next.kept, key, next.t,
                    denoiser.mask_token(), state);

  if (s.kind == SamplerKind::kProbabilityFlow) {
    // Heun's correction (Karras et al. 2022, Algorithm 1): redo the Euler step from the old
    // state with the mean of the predictions at both ends.
    denoiser.Predict(*state, next.t, worker, p);
    const std::vector<int> tokens = state->tokens;
    *state = before;
    state->tokens = tokens;
    const LatticeFeatures mean_noise = 0.5 * (first_noise + p->lattice_noise);
    state->lattice = LatticePredictor(s, level, false, state->lattice, mean_noise, lattice_noise);
    // Coordinates: x + (sigma_next - sigma) (d + d') / 2 with d = -sigma score.
    const double h = level.sigma_next - level.sigma;
    for (std::size_t i = 0; i < state->frac.size(); ++i) {
      for (int j = 0; j < 3; ++j) {
        const double d = -level.sigma * first_score(i, j);
        const double d_next = -level.sigma_next * p->score(i, j);
        state->frac[i][j] = Wrap(state->frac[i][j] + 0.5 * h * (d + d_next));
      }
    }
    ImposeConstraints(c, next.lattice.alpha_bar, next.sigma, next.kept, key, next.t,
                      denoiser.mask_token(), state);
    return;
  }
  if (s.kind == SamplerKind::kPredictorCorrector) {
    RandomStream corrector(key.seed, key.index, static_cast<std::uint32_t>(next.t),
                           Purpose::kSampleCorrector);
    for (int j = 0; j < s.corrector_steps; ++j) {
      denoiser.Predict(*state, next.t, worker, p);
      CorrectorStep(s, next, *p, corrector, state);
      ImposeConstraints(c, next.lattice.alpha_bar, next.sigma, next.kept, key, next.t,
                        denoiser.mask_token(), state);
    }
  }
}

}  // namespace nucleate::sample
