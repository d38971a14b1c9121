// How the reverse process is walked: which sampler, over how many of the model's steps, and the
// knobs each sampler has. The formulas are in core/sample/DESIGN.md, "Samplers".
#pragma once

namespace nucleate::sample {

enum class SamplerKind {
  kDdpm,                // ancestral steps (Ho et al. 2020; Song et al. 2021 for the torus)
  kDdim,                // Song, Meng and Ermon 2021, with eta
  kPredictorCorrector,  // reverse-SDE predictor + Langevin corrector (Song et al. 2021)
  kProbabilityFlow,     // the probability-flow ODE, Euler steps (Song et al. 2021)
};

// The variance of a DDPM step (Ho et al. 2020, sec. 3.2): the posterior variance beta-tilde, or
// the forward step's beta (on the torus: sigma_t^2 - sigma_{t-1}^2).
enum class DdpmVariance { kPosterior, kForward };

struct SamplerSettings {
  SamplerKind kind = SamplerKind::kDdpm;
  // Reverse steps, evenly respaced over the model's T (Nichol and Dhariwal 2021); 0 = all T.
  long long steps = 0;
  DdpmVariance ddpm_variance = DdpmVariance::kPosterior;
  double eta = 0.0;          // DDIM: 0 deterministic, 1 the ancestral (DDPM) variance
  int corrector_steps = 1;   // predictor-corrector: Langevin steps after each predictor step
  // Target signal-to-noise ratio of a corrector step; the step size is 2 (snr |z| / |score|)^2
  // (Song et al. 2021, Algorithm 4; they used 0.16 for their CIFAR-10 runs, from memory).
  double snr = 0.16;
  // The predicted clean lattice features are clipped to +-lattice_clip standard deviations of
  // the training set (x0 clipping, Ho et al. 2020): near t = T, 1/sqrt(alpha_bar) is large and an
  // imperfect noise prediction would throw the cell far outside anything seen. 0 = no clipping.
  double lattice_clip = 5.0;
};

// InvalidArgument naming the field ("sampler.steps", "sampler.eta", ...). `model_steps` is the
// model's T: steps may not exceed it.
void ValidateSamplerSettings(const SamplerSettings& settings, long long model_steps);

}  // namespace nucleate::sample
