// The hyperparameters that fix a denoiser's shape and meaning (core/model/DESIGN.md). Stored in the
// model bundle; two bundles with equal architectures hold interchangeable tensors.
#pragma once

#include <algorithm>
#include <string>
#include <vector>

namespace nucleate::model {

enum class SpeciesMode {
  kGiven,      // composition-given: species are inputs, never noised
  kAbsorbing,  // de novo: absorbing discrete diffusion, the network predicts masked species
};

struct Architecture {
  int hidden = 128;              // width of atom and edge features
  int layers = 4;                // message-passing layers
  int fourier_frequencies = 4;   // K: sin/cos of 2 pi k df for k = 1..K per axis
  int radial_basis = 16;         // Gaussian radial basis functions of distance / (V/N)^(1/3)
  double radial_max = 3.0;       // their centres span 0..radial_max, in units of (V/N)^(1/3)
  int time_embedding = 32;       // sinusoidal embedding width (even)
  // Cells with at least this many atoms use cutoff neighbours (each periodic image its own edge)
  // instead of all pairs.
  int cutoff_from_atoms = 64;
  double cutoff = 3.0;           // neighbour cutoff in units of (V/N)^(1/3)
  SpeciesMode species_mode = SpeciesMode::kGiven;

  // Vocabularies. Elements: atomic numbers the model knows, ascending; the species embedding has
  // elements.size() + 1 rows (the last is the mask token).
  std::vector<int> elements;
  bool condition_composition = false;
  bool condition_crystal_system = false;
  bool condition_space_group = false;
  std::vector<std::string> properties;  // named scalar properties, standardised

  int species_tokens() const { return static_cast<int>(elements.size()) + 1; }
  // The vocabulary index of an element, or -1 when the model does not know it (binary search:
  // ValidateArchitecture keeps `elements` strictly ascending).
  int token_of(int atomic_number) const {
    const auto found = std::lower_bound(elements.begin(), elements.end(), atomic_number);
    return found != elements.end() && *found == atomic_number
               ? static_cast<int>(found - elements.begin())
               : -1;
  }
  int mask_token() const { return static_cast<int>(elements.size()); }
  int edge_features() const { return 6 * fourier_frequencies + radial_basis; }
};

// InvalidArgument naming the field ("hidden", "elements[3]", ...) for a value out of range, with
// the limits below. Loading a bundle and building a network both call it before allocating.
struct ArchitectureLimits {
  int max_hidden = 1024;
  int max_layers = 32;
  int max_fourier_frequencies = 32;
  int max_radial_basis = 128;
  int max_time_embedding = 1024;
  int max_properties = 64;
};
void ValidateArchitecture(const Architecture& architecture, const ArchitectureLimits& limits = {});

}  // namespace nucleate::model
