// Optimisation of a flat parameter array (core/model/nn/parameters.h): AdamW (Loshchilov and
// Hutter 2019) with bias correction, global-norm gradient clipping, a learning rate with linear
// warm-up then cosine decay, and an exponential moving average of the weights for sampling.
// Arithmetic in float for values and moments, double for norms and the schedule.
#pragma once

#include <cstdint>
#include <vector>

namespace nucleate::train {

struct AdamWSettings {
  double learning_rate = 1e-3;  // peak, reached at the end of warm-up
  double beta1 = 0.9;
  double beta2 = 0.999;
  double epsilon = 1e-8;
  double weight_decay = 0.0;    // decoupled: w -= lr * weight_decay * w
};

// Learning rate at optimiser step `step` (0-based): linear warm-up from peak/warmup_steps to the
// peak over warmup_steps, then cosine decay to final_fraction * peak at total_steps (and held
// there after).
double LearningRateAt(std::int64_t step, double peak, std::int64_t warmup_steps,
                      std::int64_t total_steps, double final_fraction);

// Scales `grads` in place so its Euclidean norm is at most max_norm; returns the norm before
// scaling. max_norm <= 0 disables clipping. Non-finite gradients throw Numerical("gradient").
double ClipGradientNorm(std::vector<float>* grads, double max_norm);

// The optimiser's state, saved in checkpoints so a resumed run continues bit for bit.
struct AdamWState {
  std::int64_t step = 0;       // updates done
  std::vector<float> first;    // m
  std::vector<float> second;   // v
};

// One AdamW update of `params` with `grads` at learning rate `lr`.
void AdamWStep(const AdamWSettings& settings, double lr, const std::vector<float>& grads,
               std::vector<float>* params, AdamWState* state);

// ema = decay * ema + (1 - decay) * params.
void UpdateMovingAverage(double decay, const std::vector<float>& params, std::vector<float>* ema);

}  // namespace nucleate::train
