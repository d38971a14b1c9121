// Small architectures and random noisy cells shared by the denoiser tests.
#pragma once

#include <cstdint>
#include <random>
#include <vector>

#include "core/model/architecture.h"
#include "core/model/graph_batch.h"

namespace nucleate::model::testing {

// Every optional part switched on, widths small enough for finite differences over all
// parameters; cells from 5 atoms up use cutoff neighbours, so both edge kinds are exercised.
inline Architecture TinyArchitecture() {
  Architecture a;
  a.hidden = 6;
  a.layers = 2;
  a.fourier_frequencies = 2;
  a.radial_basis = 3;
  a.time_embedding = 4;
  a.cutoff_from_atoms = 5;
  a.cutoff = 2.0;
  a.species_mode = SpeciesMode::kAbsorbing;
  a.elements = {8, 12, 13};
  a.condition_composition = true;
  a.condition_crystal_system = true;
  a.condition_space_group = true;
  a.properties = {"band_gap", "formation_energy"};
  return a;
}

// A random cell of `atoms` atoms with all conditions filled in (some deliberately missing when
// `with_missing`).
inline NoisyCell RandomCell(const Architecture& a, int atoms, std::uint64_t seed, bool with_missing) {
  std::mt19937_64 rng(seed);
  std::uniform_real_distribution<double> u(0, 1);
  NoisyCell c;
  Eigen::Matrix3d l;
  l << 3.5 + u(rng), 0, 0, 0.4 * u(rng), 3.2 + u(rng), 0, 0.3 * u(rng), -0.2 * u(rng), 3.8 + u(rng);
  c.lattice = l;
  for (double& f : c.lattice_features) f = 2 * u(rng) - 1;
  for (int i = 0; i < atoms; ++i) {
    c.frac.emplace_back(u(rng), u(rng), u(rng));
    c.tokens.push_back(static_cast<int>(rng() % a.species_tokens()));
  }
  c.time = 0.05 + 0.9 * u(rng);
  c.conditions.composition.assign(a.elements.size(), 1.0 / a.elements.size());
  c.conditions.crystal_system = 1 + static_cast<int>(rng() % 7);
  c.conditions.space_group = 1 + static_cast<int>(rng() % 230);
  for (std::size_t p = 0; p < a.properties.size(); ++p) c.conditions.properties.push_back(u(rng));
  if (with_missing) {
    c.conditions.composition.clear();
    c.conditions.space_group = 0;
    c.conditions.properties[0] = std::numeric_limits<double>::quiet_NaN();
  }
  return c;
}

}  // namespace nucleate::model::testing
