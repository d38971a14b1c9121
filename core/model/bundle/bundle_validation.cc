#include "core/model/bundle/bundle_validation.h"

#include <cmath>
#include <string>

#include "core/common/error.h"

namespace nucleate::model {
namespace {

template <typename Check>
void WithinField(const std::string& parent, Check check) {
  try {
    check();
  } catch (const Error& error) {
    throw error.WithinField(parent);
  }
}

std::string Indexed(const std::string& field, std::size_t index) {
  return field + "[" + std::to_string(index) + "]";
}

void ValidateSchedules(const ModelSchedules& s, const Architecture& architecture,
                       const schedule::ScheduleLimits& limits) {
  WithinField("lattice", [&] { schedule::ValidateVarianceParams(s.lattice, limits); });
  WithinField("coordinates", [&] { schedule::ValidateSigmaParams(s.coordinates, limits); });
  // Training draws one t for the whole cell; a respaced lattice table would number its steps
  // differently from the coordinates'. Respacing is a sampling choice, made after loading.
  if (s.lattice.respaced_steps != 0) {
    throw InvalidArgument("lattice.respaced_steps",
                          "is " + std::to_string(s.lattice.respaced_steps) +
                              "; a bundle stores the training schedule, which is not respaced");
  }
  if (s.coordinates.steps != s.lattice.steps) {
    throw InvalidArgument("coordinates.steps", "is " + std::to_string(s.coordinates.steps) +
                                                   ", differs from lattice.steps " +
                                                   std::to_string(s.lattice.steps) +
                                                   ": one time step drives all parts of a cell");
  }
  if (architecture.species_mode != SpeciesMode::kAbsorbing) return;
  WithinField("species", [&] { schedule::ValidateTransitionParams(s.species, limits); });
  if (s.species.kind != schedule::TransitionKind::kAbsorbing) {
    throw InvalidArgument("species.kind", "must be absorbing in species mode absorbing");
  }
  if (s.species.num_classes != architecture.species_tokens()) {
    throw InvalidArgument("species.num_classes", "is " + std::to_string(s.species.num_classes) +
                                                     ", the architecture has " +
                                                     std::to_string(architecture.species_tokens()) +
                                                     " species tokens (elements and the mask)");
  }
  if (s.species.steps != s.lattice.steps) {
    throw InvalidArgument("species.steps", "is " + std::to_string(s.species.steps) +
                                               ", differs from lattice.steps " +
                                               std::to_string(s.lattice.steps) +
                                               ": one time step drives all parts of a cell");
  }
}

void RequireMeanAndStd(const std::string& mean_field, double mean, const std::string& std_field,
                       double std) {
  if (!std::isfinite(mean)) throw InvalidArgument(mean_field, "is not a finite number");
  if (!std::isfinite(std) || !(std > 0.0)) {
    throw InvalidArgument(std_field, "must be a finite number > 0");
  }
}

void ValidateNormalisation(const NormalisationStatistics& n, const Architecture& architecture) {
  for (std::size_t i = 0; i < 6; ++i) {
    RequireMeanAndStd(Indexed("lattice_mean", i), n.lattice_mean[i], Indexed("lattice_std", i),
                      n.lattice_std[i]);
  }
  const std::size_t properties = architecture.properties.size();
  if (n.property_mean.size() != properties || n.property_std.size() != properties) {
    throw InvalidArgument("property_mean",
                          "has " + std::to_string(n.property_mean.size()) + " means and " +
                              std::to_string(n.property_std.size()) + " standard deviations for " +
                              std::to_string(properties) + " properties");
  }
  for (std::size_t i = 0; i < properties; ++i) {
    RequireMeanAndStd(Indexed("property_mean", i), n.property_mean[i], Indexed("property_std", i),
                      n.property_std[i]);
  }
}

void RequireHistogramLength(const std::string& field, std::size_t length, std::uint64_t max_atoms) {
  if (length > max_atoms + 1) {
    throw LimitExceeded(field, "covers cells of up to " + std::to_string(length - 1) +
                                   " atoms, above the limit of " + std::to_string(max_atoms));
  }
}

void ValidateTensors(const ModelBundle& bundle, const BundleLimits& limits) {
  const auto& tensors = bundle.layout.tensors();
  if (tensors.size() > limits.max_tensors) {
    throw LimitExceeded("tensors", std::to_string(tensors.size()) +
                                       " tensors, above the limit of " +
                                       std::to_string(limits.max_tensors));
  }
  if (bundle.layout.size() > limits.max_tensor_values) {
    throw LimitExceeded("tensors", std::to_string(bundle.layout.size()) +
                                       " values in all, above the limit of " +
                                       std::to_string(limits.max_tensor_values));
  }
  if (bundle.values.size() != bundle.layout.size()) {
    throw InvalidArgument("tensors", std::to_string(bundle.values.size()) +
                                         " values for a layout of " +
                                         std::to_string(bundle.layout.size()));
  }
  for (std::size_t k = 0; k < tensors.size(); ++k) {
    const nn::TensorSpec& spec = tensors[k];
    for (std::size_t i = 0; i < spec.size(); ++i) {
      const float value = bundle.values[spec.offset + i];
      if (!std::isfinite(value)) {
        throw InvalidArgument(Indexed("tensors", k),
                              "'" + spec.name + "' value " + std::to_string(i) + " (row " +
                                  std::to_string(i / spec.cols) + ", column " +
                                  std::to_string(i % spec.cols) + ") is not finite (" +
                                  (std::isnan(value) ? "NaN" : "infinite") + ")");
      }
    }
  }
}

bool IsLowercaseHexDigest(const std::string& text) {
  if (text.size() != 64) return false;
  for (char c : text) {
    if (!((c >= '0' && c <= '9') || (c >= 'a' && c <= 'f'))) return false;
  }
  return true;
}

}  // namespace

void ValidateModelBundle(const ModelBundle& bundle, const BundleLimits& limits) {
  const Architecture& architecture = bundle.architecture;
  WithinField("architecture", [&] { ValidateArchitecture(architecture, limits.architecture); });
  WithinField("schedules",
              [&] { ValidateSchedules(bundle.schedules, architecture, limits.schedule); });
  WithinField("normalisation", [&] { ValidateNormalisation(bundle.normalisation, architecture); });
  RequireHistogramLength("atom_counts.overall", bundle.atom_counts.overall.size(),
                         limits.max_histogram_atoms);
  for (std::size_t i = 0; i < bundle.atom_counts.by_crystal_system.size(); ++i) {
    RequireHistogramLength(Indexed("atom_counts.by_crystal_system", i),
                           bundle.atom_counts.by_crystal_system[i].size(),
                           limits.max_histogram_atoms);
  }
  ValidateTensors(bundle, limits);
  const std::string& hash = bundle.provenance.dataset_hash;
  if (!hash.empty() && !IsLowercaseHexDigest(hash)) {
    throw InvalidArgument("provenance.dataset_hash",
                          "must be 64 lowercase hexadecimal digits (a SHA-256) or empty");
  }
}

}  // namespace nucleate::model
