// Variance-exploding sigma ladders for fractional coordinates on the unit torus.
// Steps t = 1..T run from sigma_min (t = 1) to sigma_max (t = T).
#pragma once

#include <vector>

#include "core/schedule/limits.h"
#include "core/schedule/wrapped_normal.h"

namespace nucleate::schedule {

enum class SigmaKind {
  kGeometric,  // sigma_t = sigma_min * (sigma_max / sigma_min)^((t - 1) / (T - 1))
  kKarras,     // Karras et al. 2022: (sigma_min^(1/rho) + (t-1)/(T-1) (sigma_max^(1/rho) - sigma_min^(1/rho)))^rho
};

struct SigmaParams {
  SigmaKind kind = SigmaKind::kGeometric;
  long long steps = 1000;
  double sigma_min = 0.005;
  double sigma_max = 0.5;
  double rho = 7.0;  // Karras only
};

struct SigmaLevel {
  long long t = 0;
  double sigma = 0;
  double tv_distance_to_uniform = 0;
  TruncationBound truncation;  // images chosen for double precision, with its bounds
};

void ValidateSigmaParams(const SigmaParams& params, const ScheduleLimits& limits);
std::vector<SigmaLevel> BuildSigmaSchedule(const SigmaParams& params, const ScheduleLimits& limits);

}  // namespace nucleate::schedule
