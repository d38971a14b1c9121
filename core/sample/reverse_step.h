// One reverse step of one sample, from a level to the next (less noisy) one, for every sampler,
// and the known parts of a sample kept by replacement. The formulas and their sources are in
// core/sample/DESIGN.md, "Samplers"; every random number comes from the sample's own streams
// (seed, sample index, the level's step, purpose), so a sample never depends on the others.
#pragma once

#include <cstdint>
#include <vector>

#include "core/random/random_stream.h"
#include "core/sample/chain.h"
#include "core/sample/reverse_levels.h"
#include "core/sample/sampler_settings.h"

namespace nucleate::sample {

// The parts of a sample that are known, not generated. At every level they are replaced by a
// draw of the forward process q(x_t | x_0) from their clean values (constrained generation by
// replacement), and set exactly at the end.
struct ChainConstraints {
  std::vector<char> fixed_atom;             // per atom (empty: none fixed)
  std::vector<Eigen::Vector3d> clean_frac;  // per atom; used where fixed_atom
  bool fixed_lattice = false;
  model::LatticeFeatures clean_lattice = model::LatticeFeatures::Zero();  // standardised
  std::vector<char> known_species;          // per atom: species kept (absorbing models)
  std::vector<int> clean_tokens;            // per atom; used where known_species
  // Per vocabulary element: whether generated species may take it (empty: all may).
  std::vector<char> allowed_elements;
};

// Identifies a sample's random streams.
struct SampleKey {
  std::uint32_t seed = 0;
  std::uint32_t index = 0;
};

// Replaces the known parts of `state` by a draw of q(x_t | x_0) at the given noise (alpha_bar of
// the lattice, sigma of the coordinates, kept of the species): exactly the clean values when
// alpha_bar = 1, sigma = 0 and kept = 1. Draws from purpose kSampleConstraint at `step`.
void ImposeConstraints(const ChainConstraints& constraints, double alpha_bar, double sigma,
                       double kept, SampleKey key, long long step, int mask_token, ChainState* state);

// Moves `state` from levels[k] to the next level (to the clean structure after the last level),
// with corrector steps for the predictor-corrector sampler, then imposes the constraints at the
// new level. `prediction` is scratch.
void ReverseStep(const DenoisingFunction& denoiser, const SamplerSettings& settings,
                 const std::vector<ReverseLevel>& levels, std::size_t k,
                 const ChainConstraints& constraints, SampleKey key, int worker,
                 Prediction* prediction, ChainState* state);

}  // namespace nucleate::sample
