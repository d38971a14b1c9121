// A trained denoiser as core sees it: everything the sampler needs to rebuild the network and
// use it as it was trained (core/model/DESIGN.md, "The bundle"). bundle_file.h saves and loads it.
#pragma once

#include <array>
#include <cstdint>
#include <functional>
#include <string>
#include <vector>

#include "core/model/architecture.h"
#include "core/model/nn/parameters.h"
#include "core/schedule/discrete_transitions.h"
#include "core/schedule/sigma_schedule.h"
#include "core/schedule/variance_schedule.h"

namespace nucleate::model {

// The format this library writes and the newest it reads. Raise it only for a change that an
// older reader would misread; additions of fields keep it.
inline constexpr std::uint32_t kModelBundleFormatVersion = 1;

// One time step t = 1..T drives all three: their step counts are equal.
struct ModelSchedules {
  schedule::VarianceParams lattice;   // variance-preserving, on the 6 lattice numbers
  schedule::SigmaParams coordinates;  // wrapped normal on fractional coordinates
  // Used only in SpeciesMode::kAbsorbing (num_classes = species_tokens()); in kGiven mode it is
  // neither saved nor loaded and keeps its default.
  schedule::TransitionParams species;
};

// Training-set statistics that standardise the network's inputs.
struct NormalisationStatistics {
  // The 6 lattice numbers (core/model/DESIGN.md, "Lattice"); std > 0.
  std::array<double, 6> lattice_mean{};
  std::array<double, 6> lattice_std{1, 1, 1, 1, 1, 1};
  // One entry per Architecture::properties, same order; std > 0.
  std::vector<double> property_mean;
  std::vector<double> property_std;
};

// counts[n]: training cells with n atoms.
struct AtomCountHistograms {
  std::vector<std::uint64_t> overall;
  std::array<std::vector<std::uint64_t>, 7> by_crystal_system;  // [0] triclinic .. [6] cubic
};

struct Provenance {
  std::string dataset_hash;  // SHA-256 of the data set file, 64 lowercase hex digits, or empty
  std::uint32_t seed = 0;
  std::string settings;         // the training settings file (YAML), verbatim
  std::string library_version;  // nucleate_version() of the library that trained
  std::uint64_t training_steps = 0;
  std::uint64_t train_count = 0;
  std::uint64_t validation_count = 0;
  std::uint64_t test_count = 0;
};

struct ModelBundle {
  Architecture architecture;
  ModelSchedules schedules;
  NormalisationStatistics normalisation;
  AtomCountHistograms atom_counts;
  // Trained tensors: names and shapes in `layout`, values (float32, row-major per tensor) in
  // `values`, layout.size() of them.
  nn::ParameterLayout layout;
  std::vector<float> values;
  Provenance provenance;
};

// The tensor names and shapes a network of the given architecture has, in order. Loading compares
// a bundle's tensors with it when the caller passes one.
using LayoutForArchitecture = std::function<nn::ParameterLayout(const Architecture&)>;

}  // namespace nucleate::model
