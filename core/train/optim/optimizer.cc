#include "core/train/optim/optimizer.h"

#include <cmath>
#include <string>

#include "core/common/error.h"
#include "core/common/require.h"

namespace nucleate::train {
namespace {

constexpr double kPi = 3.14159265358979323846;

void RequireUnitInterval(const char* field, double value, bool one_allowed) {
  if (!std::isfinite(value) || value < 0 || value > 1 || (!one_allowed && value == 1)) {
    throw InvalidArgument(field, one_allowed ? "must be in [0, 1]" : "must be in [0, 1)");
  }
}

void RequireNonNegativeFinite(const char* field, double value) {
  if (!std::isfinite(value) || value < 0) throw InvalidArgument(field, "must be finite and >= 0");
}

void RequireSameSize(const char* field, std::size_t size, std::size_t expected) {
  if (size != expected) {
    throw InvalidArgument(field, "has " + std::to_string(size) + " values, the parameters have " +
                                     std::to_string(expected));
  }
}

}  // namespace

double LearningRateAt(std::int64_t step, double peak, std::int64_t warmup_steps,
                      std::int64_t total_steps, double final_fraction) {
  if (step < 0) throw InvalidArgument("step", "must be >= 0");
  RequireNonNegativeFinite("peak", peak);
  if (warmup_steps < 0) throw InvalidArgument("warmup_steps", "must be >= 0");
  if (total_steps < warmup_steps) {
    throw InvalidArgument("total_steps", "must be >= warmup_steps");
  }
  RequireUnitInterval("final_fraction", final_fraction, true);

  // Linear warm-up (Goyal et al. 2017): step k of W runs at (k + 1) / W of the peak, so the first
  // update is already non-zero and the last warm-up step reaches the peak.
  if (step < warmup_steps) {
    return peak * static_cast<double>(step + 1) / static_cast<double>(warmup_steps);
  }
  // Cosine decay (Loshchilov and Hutter 2017, eq. 5) from the peak to final_fraction * peak.
  const std::int64_t decay_steps = total_steps - warmup_steps;
  if (step >= total_steps || decay_steps == 0) return final_fraction * peak;
  const double progress =
      static_cast<double>(step - warmup_steps) / static_cast<double>(decay_steps);
  return peak * (final_fraction + (1 - final_fraction) * 0.5 * (1 + std::cos(kPi * progress)));
}

double ClipGradientNorm(std::vector<float>* grads, double max_norm) {
  if (std::isnan(max_norm)) throw InvalidArgument("max_norm", "must be a number");
  // Squares of floats summed in double neither overflow nor lose the small entries, so a
  // non-finite sum means a non-finite gradient entry.
  double sum_of_squares = 0;
  for (const float g : *grads) sum_of_squares += static_cast<double>(g) * g;
  if (!std::isfinite(sum_of_squares)) {
    throw Numerical("gradient", "is not finite (NaN or infinity in the backward pass)");
  }
  const double norm = std::sqrt(sum_of_squares);
  if (max_norm > 0 && norm > max_norm) {
    const double scale = max_norm / norm;
    for (float& g : *grads) g = static_cast<float>(g * scale);
  }
  return norm;
}

// AdamW, Loshchilov and Hutter 2019, Algorithm 2, with t = state->step after the increment,
// g the gradient, lr the scheduled learning rate and lambda = settings.weight_decay:
//   m_t = beta1 m_{t-1} + (1 - beta1) g
//   v_t = beta2 v_{t-1} + (1 - beta2) g^2
//   m^_t = m_t / (1 - beta1^t),  v^_t = v_t / (1 - beta2^t)
//   w_t = w_{t-1} - lr (m^_t / (sqrt(v^_t) + epsilon) + lambda w_{t-1})
// lr stands for the paper's eta_t alpha; the decay is scaled by lr as well (the paper scales it
// by eta_t only), so lambda here is the paper's lambda / alpha. The decay acts on w_{t-1}, apart
// from the gradient: that is what makes it "decoupled". Each update is formed in double and
// rounded once to float, which keeps small updates of large weights from vanishing in rounding.
void AdamWStep(const AdamWSettings& settings, double lr, const std::vector<float>& grads,
               std::vector<float>* params, AdamWState* state) {
  RequireNonNegativeFinite("learning_rate", lr);
  RequireUnitInterval("beta1", settings.beta1, false);
  RequireUnitInterval("beta2", settings.beta2, false);
  RequirePositiveFinite("epsilon", settings.epsilon);
  RequireNonNegativeFinite("weight_decay", settings.weight_decay);
  const std::size_t n = params->size();
  RequireSameSize("grads", grads.size(), n);
  // A fresh state starts its moments at zero, as in the paper.
  if (state->step == 0 && state->first.empty() && state->second.empty()) {
    state->first.assign(n, 0.0f);
    state->second.assign(n, 0.0f);
  }
  RequireSameSize("state.first", state->first.size(), n);
  RequireSameSize("state.second", state->second.size(), n);

  ++state->step;
  const double t = static_cast<double>(state->step);
  const double beta1 = settings.beta1, beta2 = settings.beta2;
  const double first_correction = 1 - std::pow(beta1, t);
  const double second_correction = 1 - std::pow(beta2, t);
  const double decay = lr * settings.weight_decay;
  for (std::size_t i = 0; i < n; ++i) {
    const double g = grads[i];
    const double m = beta1 * state->first[i] + (1 - beta1) * g;
    const double v = beta2 * state->second[i] + (1 - beta2) * g * g;
    state->first[i] = static_cast<float>(m);
    state->second[i] = static_cast<float>(v);
    const double m_hat = m / first_correction;
    const double v_hat = v / second_correction;
    const double w = (*params)[i];
    (*params)[i] = static_cast<float>(w - lr * m_hat / (std::sqrt(v_hat) + settings.epsilon) -
                                      decay * w);
  }
}

void UpdateMovingAverage(double decay, const std::vector<float>& params, std::vector<float>* ema) {
  RequireUnitInterval("decay", decay, true);
  RequireSameSize("ema", ema->size(), params.size());
  for (std::size_t i = 0; i < params.size(); ++i) {
    (*ema)[i] = static_cast<float>(decay * (*ema)[i] + (1 - decay) * params[i]);
  }
}

}  // namespace nucleate::train
