// A small network with random weights around which the sampling path can be exercised (the
// sampler, the C ABI's Sample method): nothing about its structures is meaningful.
#pragma once

#include "core/model/bundle/model_bundle.h"
#include "core/model/denoiser.h"
#include "core/model/diffusion.h"
#include "core/model/lattice_features.h"
#include "core/model/nn/parameters.h"

namespace nucleate::sample::testing {

// Hidden 16, one layer, 50 steps; Na and Cl; conditioned on crystal system; random weights.
inline model::ModelBundle RandomNetwork(model::SpeciesMode mode = model::SpeciesMode::kGiven) {
  model::ModelBundle b;
  model::Architecture& a = b.architecture;
  a.hidden = 16;
  a.layers = 1;
  a.time_embedding = 8;
  a.fourier_frequencies = 2;
  a.radial_basis = 4;
  a.elements = {11, 17};
  a.species_mode = mode;
  a.condition_crystal_system = true;
  b.schedules = model::DefaultModelSchedules();
  b.schedules.lattice.steps = b.schedules.coordinates.steps = b.schedules.species.steps = 50;
  b.schedules.species.num_classes = a.species_tokens();
  Eigen::Matrix3d fcc;
  fcc << 0, 2.82, 2.82, 2.82, 0, 2.82, 2.82, 2.82, 0;
  const model::LatticeFeatures mean = model::LatticeToFeatures(fcc, 2);
  for (int k = 0; k < 6; ++k) {
    b.normalisation.lattice_mean[k] = mean[k];
    b.normalisation.lattice_std[k] = 0.3;
  }
  b.atom_counts.overall = {0, 0, 5, 0, 3};
  const model::Denoiser net(a);
  b.layout = net.layout();
  b.values = model::nn::Initialise<float>(b.layout, 7);
  return b;
}

}  // namespace nucleate::sample::testing
