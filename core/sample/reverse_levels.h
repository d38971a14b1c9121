// The noise levels a sampler walks, noisiest first: the model's T steps, or an evenly respaced
// subset of them (Nichol and Dhariwal 2021), with everything one reverse step needs for each of
// the three diffused parts.
#pragma once

#include <vector>

#include "core/model/diffusion.h"
#include "core/schedule/variance_schedule.h"

namespace nucleate::sample {

struct ReverseLevel {
  long long t = 0;  // the model's step (1..T): the network is told t / T
  // Lattice (variance-preserving) of the respaced chain: alpha_bar at t, and beta and the
  // posterior q(x_next | x_t, x_0) of the step to the next level.
  schedule::VarianceStep lattice;
  double alpha_bar_next = 1;  // at the next level; 1 (clean) after the last
  // Coordinates (variance-exploding on the torus): sigma at t and at the next level (0 after the
  // last), and the scale the network's score output is multiplied by.
  double sigma = 0, sigma_next = 0;
  double score_scale = 1;
  // Species (absorbing): probability that an atom is still unmasked at t and at the next level.
  double kept = 1, kept_next = 1;
};

// `steps` = 0 or T keeps every step; otherwise steps source_i = round(i T / steps), i = 1..steps,
// as core/schedule respaces. InvalidArgument("sampler.steps") outside 0..T.
std::vector<ReverseLevel> BuildReverseLevels(const model::DiffusionProcess& process, long long steps);

// The index of the first level at or below step `t` (levels are noisiest first): where a chain
// that starts from a structure noised to step t begins. 0 <= result < levels.size() for t >= 1.
std::size_t FirstLevelAtOrBelow(const std::vector<ReverseLevel>& levels, long long t);

}  // namespace nucleate::sample
