#include "core/model/architecture.h"

#include <cmath>
#include <set>
#include <string>

#include "core/common/error.h"

namespace nucleate::model {
namespace {

constexpr int kHeaviestElement = 118;  // oganesson, the last element named by IUPAC
// Property names appear in requests, logs and file headers; a bound keeps a damaged bundle from
// carrying megabytes of name (common practice, no source).
constexpr std::size_t kMaxPropertyNameBytes = 256;

void RequireInRange(const char* field, int value, int low, int high) {
  if (value < low || value > high) {
    throw InvalidArgument(field, "is " + std::to_string(value) + ", must be in " +
                                     std::to_string(low) + ".." + std::to_string(high));
  }
}

void RequirePositiveFiniteValue(const char* field, double value) {
  if (!std::isfinite(value) || !(value > 0.0)) {
    throw InvalidArgument(field, "must be a finite number > 0");
  }
}

void ValidateElements(const std::vector<int>& elements) {
  if (elements.empty()) throw InvalidArgument("elements", "must list at least one element");
  for (std::size_t i = 0; i < elements.size(); ++i) {
    const std::string field = "elements[" + std::to_string(i) + "]";
    if (elements[i] < 1 || elements[i] > kHeaviestElement) {
      throw InvalidArgument(field, "atomic number " + std::to_string(elements[i]) +
                                       " is outside 1.." + std::to_string(kHeaviestElement));
    }
    // Ascending without repeats: token k means the same element in every bundle with this list.
    if (i > 0 && elements[i] <= elements[i - 1]) {
      throw InvalidArgument(field, "must be greater than the previous element (" +
                                       std::to_string(elements[i - 1]) +
                                       "): the list is strictly ascending");
    }
  }
}

void ValidateProperties(const std::vector<std::string>& properties, int max_properties) {
  if (static_cast<long long>(properties.size()) > max_properties) {
    throw InvalidArgument("properties", std::to_string(properties.size()) +
                                            " properties, at most " +
                                            std::to_string(max_properties) + " allowed");
  }
  std::set<std::string> seen;
  for (std::size_t i = 0; i < properties.size(); ++i) {
    const std::string field = "properties[" + std::to_string(i) + "]";
    if (properties[i].empty()) throw InvalidArgument(field, "name is empty");
    if (properties[i].size() > kMaxPropertyNameBytes) {
      throw InvalidArgument(field, "name is " + std::to_string(properties[i].size()) +
                                       " bytes, at most " + std::to_string(kMaxPropertyNameBytes) +
                                       " allowed");
    }
    if (!seen.insert(properties[i]).second) {
      throw InvalidArgument(field, "repeats the property name '" + properties[i] + "'");
    }
  }
}

}  // namespace

void ValidateArchitecture(const Architecture& a, const ArchitectureLimits& limits) {
  RequireInRange("hidden", a.hidden, 1, limits.max_hidden);
  RequireInRange("layers", a.layers, 1, limits.max_layers);
  RequireInRange("fourier_frequencies", a.fourier_frequencies, 1, limits.max_fourier_frequencies);
  RequireInRange("radial_basis", a.radial_basis, 1, limits.max_radial_basis);
  RequirePositiveFiniteValue("radial_max", a.radial_max);
  RequireInRange("time_embedding", a.time_embedding, 2, limits.max_time_embedding);
  // Sinusoidal embeddings pair a sine with a cosine per frequency.
  if (a.time_embedding % 2 != 0) {
    throw InvalidArgument("time_embedding",
                          "is " + std::to_string(a.time_embedding) + ", must be even");
  }
  // A cell needs two atoms for an edge; below that the threshold would mean "always cutoff".
  if (a.cutoff_from_atoms < 2) {
    throw InvalidArgument("cutoff_from_atoms",
                          "is " + std::to_string(a.cutoff_from_atoms) + ", must be >= 2");
  }
  RequirePositiveFiniteValue("cutoff", a.cutoff);
  if (a.species_mode != SpeciesMode::kGiven && a.species_mode != SpeciesMode::kAbsorbing) {
    throw InvalidArgument(
        "species_mode", "unknown species mode " + std::to_string(static_cast<int>(a.species_mode)));
  }
  ValidateElements(a.elements);
  ValidateProperties(a.properties, limits.max_properties);
}

}  // namespace nucleate::model
