// Discrete (categorical) diffusion for species, Austin et al. 2021 (D3PM).
// Matrices are row-stochastic: Q[i][j] = q(x_t = j | x_{t-1} = i).
// Uniform:   Q_t = (1 - beta_t) I + beta_t / K * 1 1^T
// Absorbing: Q_t = (1 - beta_t) I + beta_t * 1 e_m^T, where m = K - 1 is the mask class.
// Cumulative products have the same form with 1 - alpha_bar_t in place of beta_t,
// alpha_bar_t = prod_{s <= t} (1 - beta_s).
#pragma once

#include <vector>

#include <Eigen/Dense>

#include "core/schedule/limits.h"

namespace nucleate::schedule {

enum class TransitionKind { kUniform, kAbsorbing };
enum class RetentionKind {
  kCosine,       // alpha_bar from the cosine schedule (offset s), as for Gaussian noise
  kReciprocal,   // beta_t = 1 / (T - t + 1): alpha_bar_t = 1 - t / T (Austin et al. 2021, absorbing)
};

struct TransitionParams {
  TransitionKind kind = TransitionKind::kAbsorbing;
  RetentionKind retention = RetentionKind::kReciprocal;
  long long steps = 1000;
  long long num_classes = 0;    // K, including the mask class for kAbsorbing
  double cosine_offset = 0.008;
};

struct TransitionStep {
  long long t = 0;
  double beta = 0;       // probability of leaving for the kernel's target at step t
  double alpha_bar = 0;  // probability of still being in the original class after t steps
};

void ValidateTransitionParams(const TransitionParams& params, const ScheduleLimits& limits);
std::vector<TransitionStep> BuildTransitionSchedule(const TransitionParams& params,
                                                    const ScheduleLimits& limits);
Eigen::MatrixXd TransitionMatrix(TransitionKind kind, long long num_classes, double beta);
// The same closed form: pass 1 - alpha_bar as the leaving probability.
Eigen::MatrixXd CumulativeTransitionMatrix(TransitionKind kind, long long num_classes,
                                           double alpha_bar);

}  // namespace nucleate::schedule
