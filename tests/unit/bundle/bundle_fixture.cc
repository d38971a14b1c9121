#include "bundle_fixture.h"

#include <gtest/gtest.h>

#include <cstdlib>
#include <filesystem>
#include <limits>

#include "core/common/sha256.h"

namespace nucleate::model::testing {

ModelBundle SmallBundle() {
  ModelBundle b;
  Architecture& a = b.architecture;
  a.hidden = 8;
  a.layers = 1;
  a.fourier_frequencies = 2;
  a.radial_basis = 4;
  a.radial_max = 2.5;
  a.time_embedding = 6;
  a.cutoff_from_atoms = 32;
  a.cutoff = 2.75;
  a.species_mode = SpeciesMode::kAbsorbing;
  a.elements = {3, 8, 26};
  a.condition_composition = true;
  a.condition_space_group = true;
  a.properties = {"band_gap_ev"};

  b.schedules.lattice.kind = schedule::VarianceKind::kCosine;
  b.schedules.lattice.steps = 500;
  b.schedules.lattice.cosine_offset = 0.01;
  b.schedules.coordinates.kind = schedule::SigmaKind::kKarras;
  b.schedules.coordinates.steps = 500;
  b.schedules.coordinates.sigma_min = 0.004;
  b.schedules.species.kind = schedule::TransitionKind::kAbsorbing;
  b.schedules.species.retention = schedule::RetentionKind::kCosine;
  b.schedules.species.steps = 500;
  b.schedules.species.num_classes = a.species_tokens();

  b.normalisation.lattice_mean = {2.5, 2.25, 2.75, 0.125, -0.0625, 0.0};
  b.normalisation.lattice_std = {0.5, 0.25, 0.75, 0.3, 0.2, 0.1};
  b.normalisation.property_mean = {1.75};
  b.normalisation.property_std = {1.125};

  b.atom_counts.overall = {0, 3, 10, 0, 7};
  b.atom_counts.by_crystal_system[0] = {0, 1};
  b.atom_counts.by_crystal_system[6] = {0, 2, 10, 0, 7};

  b.layout.Add("species_embedding", a.species_tokens(), a.hidden, nn::TensorSpec::Init::kNormal,
               0.1);
  b.layout.Add("layer0.edge_in.weight", a.edge_features(), a.hidden, nn::TensorSpec::Init::kNormal,
               0.2);
  b.layout.Add("layer0.edge_in.bias", 1, a.hidden, nn::TensorSpec::Init::kZero, 0.0);
  b.values.resize(b.layout.size());
  for (std::size_t i = 0; i < b.values.size(); ++i) {
    b.values[i] = static_cast<float>(i % 17) / 7.0f - 1.0f;  // sevenths use every mantissa bit
  }
  b.values[0] = -0.0f;
  b.values[1] = std::numeric_limits<float>::denorm_min();
  b.values[2] = std::numeric_limits<float>::max();
  b.values[3] = -std::numeric_limits<float>::min();

  b.provenance.dataset_hash = ToHex(Sha256(std::string("a data set")));
  b.provenance.seed = 4000000000u;  // above 2^31: a signed field would garble it
  b.provenance.settings = "model:\n  hidden: 8\ntraining:\n  steps: 1200\n";
  b.provenance.library_version = "0.1.0";
  b.provenance.training_steps = 1200;
  b.provenance.train_count = 16;
  b.provenance.validation_count = 2;
  b.provenance.test_count = 2;
  return b;
}

Error ErrorFrom(const std::function<void()>& action) {
  try {
    action();
  } catch (const Error& error) {
    return error;
  }
  ADD_FAILURE() << "no error was raised";
  return Internal("no error was raised");
}

TemporaryDirectory::TemporaryDirectory() {
  std::string pattern =
      (std::filesystem::temp_directory_path() / "nucleate_bundle_test_XXXXXX").string();
  if (::mkdtemp(pattern.data()) == nullptr) {
    ADD_FAILURE() << "cannot create a temporary directory from " << pattern;
  }
  path_ = pattern;
}

TemporaryDirectory::~TemporaryDirectory() {
  std::error_code ignored;
  std::filesystem::remove_all(path_, ignored);
}

}  // namespace nucleate::model::testing
