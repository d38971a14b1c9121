#include "core/model/bundle/bundle_messages.h"

#include <set>
#include <string>

#include "core/common/error.h"
#include "core/model/bundle/bundle_validation.h"
#include "core/model/bundle/schedule_messages.h"

namespace nucleate::model {
namespace {

// Tensor names appear in messages and logs; a bound keeps a damaged file from carrying megabytes
// of name (common practice, no source).
constexpr std::size_t kMaxTensorNameBytes = 256;

template <typename Convert>
auto WithinField(const std::string& parent, Convert convert) {
  try {
    return convert();
  } catch (const Error& error) {
    throw error.WithinField(parent);
  }
}

std::string Indexed(const std::string& field, int index) {
  return field + "[" + std::to_string(index) + "]";
}

std::string Shape(int rows, int cols) { return std::to_string(rows) + "x" + std::to_string(cols); }

// ---- architecture -------------------------------------------------------------------------------

v1::SpeciesMode ToMessage(SpeciesMode mode) {
  return mode == SpeciesMode::kAbsorbing ? v1::SPECIES_MODE_ABSORBING : v1::SPECIES_MODE_GIVEN;
}

SpeciesMode FromMessage(v1::SpeciesMode mode) {
  switch (mode) {
    case v1::SPECIES_MODE_UNSPECIFIED:
    case v1::SPECIES_MODE_GIVEN:
      return SpeciesMode::kGiven;
    case v1::SPECIES_MODE_ABSORBING:
      return SpeciesMode::kAbsorbing;
    default:
      break;
  }
  throw InvalidArgument("species_mode", "unknown species mode " + std::to_string(mode));
}

void ToMessage(const Architecture& a, v1::ModelArchitecture* m) {
  m->set_hidden(a.hidden);
  m->set_layers(a.layers);
  m->set_fourier_frequencies(a.fourier_frequencies);
  m->set_radial_basis(a.radial_basis);
  m->set_radial_max(a.radial_max);
  m->set_time_embedding(a.time_embedding);
  m->set_cutoff_from_atoms(a.cutoff_from_atoms);
  m->set_cutoff(a.cutoff);
  m->set_species_mode(ToMessage(a.species_mode));
  for (int z : a.elements) m->add_elements(z);
  m->set_condition_composition(a.condition_composition);
  m->set_condition_crystal_system(a.condition_crystal_system);
  m->set_condition_space_group(a.condition_space_group);
  for (const std::string& name : a.properties) m->add_properties(name);
}

Architecture FromMessage(const v1::ModelArchitecture& m) {
  Architecture a;
  a.hidden = m.hidden();
  a.layers = m.layers();
  a.fourier_frequencies = m.fourier_frequencies();
  a.radial_basis = m.radial_basis();
  a.radial_max = m.radial_max();
  a.time_embedding = m.time_embedding();
  a.cutoff_from_atoms = m.cutoff_from_atoms();
  a.cutoff = m.cutoff();
  a.species_mode = FromMessage(m.species_mode());
  a.elements.assign(m.elements().begin(), m.elements().end());
  a.condition_composition = m.condition_composition();
  a.condition_crystal_system = m.condition_crystal_system();
  a.condition_space_group = m.condition_space_group();
  a.properties.assign(m.properties().begin(), m.properties().end());
  return a;
}

// ---- schedules ----------------------------------------------------------------------------------

void ToMessage(const ModelSchedules& s, SpeciesMode mode, v1::ModelSchedules* m) {
  model::ToMessage(s.lattice, m->mutable_lattice());
  model::ToMessage(s.coordinates, m->mutable_coordinates());
  if (mode == SpeciesMode::kAbsorbing) model::ToMessage(s.species, m->mutable_species());
}

ModelSchedules FromMessage(const v1::ModelSchedules& m, SpeciesMode mode) {
  // A left-out schedule would silently become core's defaults: the model would be sampled with
  // noise it was not trained on.
  if (!m.has_lattice()) throw InvalidArgument("lattice", "is missing");
  if (!m.has_coordinates()) throw InvalidArgument("coordinates", "is missing");
  ModelSchedules s;
  s.lattice = WithinField("lattice", [&] { return model::FromMessage(m.lattice()); });
  s.coordinates = WithinField("coordinates", [&] { return model::FromMessage(m.coordinates()); });
  if (mode == SpeciesMode::kAbsorbing) {
    if (!m.has_species()) throw InvalidArgument("species", "is missing (species mode absorbing)");
    s.species = WithinField("species", [&] { return model::FromMessage(m.species()); });
  } else if (m.has_species()) {
    throw InvalidArgument("species", "is present, but species mode given has no species noise");
  }
  return s;
}

// ---- statistics ---------------------------------------------------------------------------------

void ToMessage(const NormalisationStatistics& n, v1::ModelNormalisation* m) {
  for (double v : n.lattice_mean) m->add_lattice_mean(v);
  for (double v : n.lattice_std) m->add_lattice_std(v);
  for (double v : n.property_mean) m->add_property_mean(v);
  for (double v : n.property_std) m->add_property_std(v);
}

NormalisationStatistics FromMessage(const v1::ModelNormalisation& m) {
  if (m.lattice_mean_size() != 6 || m.lattice_std_size() != 6) {
    throw InvalidArgument("lattice_mean", "has " + std::to_string(m.lattice_mean_size()) +
                                              " means and " + std::to_string(m.lattice_std_size()) +
                                              " standard deviations; the lattice has 6 numbers");
  }
  NormalisationStatistics n;
  for (int i = 0; i < 6; ++i) {
    n.lattice_mean[i] = m.lattice_mean(i);
    n.lattice_std[i] = m.lattice_std(i);
  }
  n.property_mean.assign(m.property_mean().begin(), m.property_mean().end());
  n.property_std.assign(m.property_std().begin(), m.property_std().end());
  return n;
}

void ToMessage(const std::vector<std::uint64_t>& counts, v1::AtomCountHistogram* m) {
  m->mutable_counts()->Add(counts.begin(), counts.end());
}

std::vector<std::uint64_t> FromMessage(const v1::AtomCountHistogram& m, std::uint64_t max_atoms) {
  if (static_cast<std::uint64_t>(m.counts_size()) > max_atoms + 1) {
    throw LimitExceeded("counts", "cover cells of up to " + std::to_string(m.counts_size() - 1) +
                                      " atoms, above the limit of " + std::to_string(max_atoms));
  }
  return {m.counts().begin(), m.counts().end()};
}

void ToMessage(const AtomCountHistograms& h, v1::AtomCountHistograms* m) {
  ToMessage(h.overall, m->mutable_overall());
  for (const auto& counts : h.by_crystal_system) ToMessage(counts, m->add_by_crystal_system());
}

AtomCountHistograms FromMessage(const v1::AtomCountHistograms& m, std::uint64_t max_atoms) {
  AtomCountHistograms h;
  if (m.by_crystal_system_size() != 7) {
    throw InvalidArgument("by_crystal_system", "has " + std::to_string(m.by_crystal_system_size()) +
                                                   " histograms, one per crystal system (7) "
                                                   "expected");
  }
  h.overall = WithinField("overall", [&] { return FromMessage(m.overall(), max_atoms); });
  for (int i = 0; i < 7; ++i) {
    h.by_crystal_system[i] = WithinField(Indexed("by_crystal_system", i), [&] {
      return FromMessage(m.by_crystal_system(i), max_atoms);
    });
  }
  return h;
}

// ---- provenance ---------------------------------------------------------------------------------

void ToMessage(const Provenance& p, v1::ModelProvenance* m) {
  m->set_dataset_hash(p.dataset_hash);
  m->set_seed(p.seed);
  m->set_settings(p.settings);
  m->set_library_version(p.library_version);
  m->set_training_steps(p.training_steps);
  m->set_train_count(p.train_count);
  m->set_validation_count(p.validation_count);
  m->set_test_count(p.test_count);
}

Provenance FromMessage(const v1::ModelProvenance& m) {
  Provenance p;
  p.dataset_hash = m.dataset_hash();
  p.seed = m.seed();
  p.settings = m.settings();
  p.library_version = m.library_version();
  p.training_steps = m.training_steps();
  p.train_count = m.train_count();
  p.validation_count = m.validation_count();
  p.test_count = m.test_count();
  return p;
}

// ---- tensors ------------------------------------------------------------------------------------

// Every shape against its values and the total against the limit, before the flat array exists.
std::uint64_t CheckTensorSizes(const v1::ModelBundle& m, const BundleLimits& limits) {
  if (static_cast<std::uint64_t>(m.tensors_size()) > limits.max_tensors) {
    throw LimitExceeded("tensors", std::to_string(m.tensors_size()) +
                                       " tensors, above the limit of " +
                                       std::to_string(limits.max_tensors));
  }
  std::set<std::string> names;
  std::uint64_t total = 0;
  for (int k = 0; k < m.tensors_size(); ++k) {
    const v1::ModelTensor& t = m.tensors(k);
    const std::string field = Indexed("tensors", k);
    if (t.name().empty()) throw InvalidArgument(field, "has no name");
    if (t.name().size() > kMaxTensorNameBytes) {
      throw InvalidArgument(field, "name is " + std::to_string(t.name().size()) +
                                       " bytes, at most " + std::to_string(kMaxTensorNameBytes) +
                                       " allowed");
    }
    if (!names.insert(t.name()).second) {
      throw InvalidArgument(field, "repeats the tensor name '" + t.name() + "'");
    }
    if (t.rows() < 1 || t.cols() < 1) {
      throw InvalidArgument(field, "'" + t.name() + "' has shape " + Shape(t.rows(), t.cols()) +
                                       "; rows and cols must be >= 1");
    }
    const std::uint64_t size = static_cast<std::uint64_t>(t.rows()) * t.cols();
    if (size != static_cast<std::uint64_t>(t.values_size())) {
      throw InvalidArgument(field, "'" + t.name() + "' has shape " + Shape(t.rows(), t.cols()) +
                                       " but " + std::to_string(t.values_size()) + " values");
    }
    total += size;  // each term is below 2^31, the count below 2^32: no overflow
    if (total > limits.max_tensor_values) {
      throw LimitExceeded("tensors", "hold more than " + std::to_string(limits.max_tensor_values) +
                                         " values in all, the limit");
    }
  }
  return total;
}

void RequireLayoutMatches(const v1::ModelBundle& m, const nn::ParameterLayout& expected) {
  const auto& specs = expected.tensors();
  if (static_cast<std::size_t>(m.tensors_size()) != specs.size()) {
    throw InvalidArgument("tensors", "holds " + std::to_string(m.tensors_size()) +
                                         " tensors; the architecture expects " +
                                         std::to_string(specs.size()));
  }
  for (int k = 0; k < m.tensors_size(); ++k) {
    const v1::ModelTensor& t = m.tensors(k);
    const nn::TensorSpec& spec = specs[k];
    const std::string field = Indexed("tensors", k);
    if (t.name() != spec.name) {
      throw InvalidArgument(
          field, "is named '" + t.name() + "'; the architecture expects '" + spec.name + "' here");
    }
    if (t.rows() != spec.rows || t.cols() != spec.cols) {
      throw InvalidArgument(field, "'" + t.name() + "' has shape " + Shape(t.rows(), t.cols()) +
                                       "; the architecture expects shape " +
                                       Shape(spec.rows, spec.cols));
    }
  }
}

}  // namespace

void ToMessage(const ModelBundle& bundle, v1::ModelBundle* message) {
  message->set_format_version(kModelBundleFormatVersion);
  ToMessage(bundle.architecture, message->mutable_architecture());
  ToMessage(bundle.schedules, bundle.architecture.species_mode, message->mutable_schedules());
  ToMessage(bundle.normalisation, message->mutable_normalisation());
  ToMessage(bundle.atom_counts, message->mutable_atom_counts());
  for (const nn::TensorSpec& spec : bundle.layout.tensors()) {
    v1::ModelTensor* tensor = message->add_tensors();
    tensor->set_name(spec.name);
    tensor->set_rows(spec.rows);
    tensor->set_cols(spec.cols);
    const float* first = bundle.values.data() + spec.offset;
    tensor->mutable_values()->Add(first, first + spec.size());
  }
  ToMessage(bundle.provenance, message->mutable_provenance());
}

ModelBundle FromMessage(const v1::ModelBundle& m, const BundleLimits& limits,
                        const LayoutForArchitecture& expected_layout) {
  ModelBundle bundle;
  bundle.architecture = WithinField("architecture", [&] { return FromMessage(m.architecture()); });
  // Before anything is sized by the architecture (the expected layout, the schedules).
  WithinField("architecture",
              [&] { ValidateArchitecture(bundle.architecture, limits.architecture); });
  bundle.schedules = WithinField(
      "schedules", [&] { return FromMessage(m.schedules(), bundle.architecture.species_mode); });
  bundle.normalisation =
      WithinField("normalisation", [&] { return FromMessage(m.normalisation()); });
  bundle.atom_counts = WithinField(
      "atom_counts", [&] { return FromMessage(m.atom_counts(), limits.max_histogram_atoms); });
  bundle.provenance = FromMessage(m.provenance());

  const std::uint64_t total_values = CheckTensorSizes(m, limits);
  if (expected_layout) {
    bundle.layout = expected_layout(bundle.architecture);
    RequireLayoutMatches(m, bundle.layout);
  } else {
    // Only names and shapes are known; how a tensor was initialised no longer matters.
    for (const v1::ModelTensor& t : m.tensors()) {
      bundle.layout.Add(t.name(), t.rows(), t.cols(), nn::TensorSpec::Init::kZero, 0.0);
    }
  }
  bundle.values.reserve(static_cast<std::size_t>(total_values));
  for (const v1::ModelTensor& t : m.tensors()) {
    bundle.values.insert(bundle.values.end(), t.values().begin(), t.values().end());
  }
  ValidateModelBundle(bundle, limits);
  return bundle;
}

}  // namespace nucleate::model
