// What a caller asks of the sampler: one of four tasks, the conditions and guidance, the sampler,
// the random key (seed, first sample index, count) and the limits. Sample i of a job is a
// function of (model, task, conditions, sampler, seed, first_index + i) only.
#pragma once

#include <cstdint>
#include <string>
#include <utility>
#include <vector>

#include "core/sample/sampler_settings.h"
#include "core/structure/crystal.h"

namespace nucleate::sample {

enum class TaskKind {
  kComposition,  // structure prediction: a given formula, a given number or range of formula units
  kDeNovo,       // species generated too (absorbing models), optionally from allowed elements
  kVariation,    // a given structure noised to a chosen level, then denoised
  kConstrained,  // chosen atoms and/or the lattice of a given structure kept, the rest generated
};

struct CompositionTask {
  // (atomic number, atoms per formula unit), e.g. {(38, 1), (22, 1), (8, 3)} for SrTiO3.
  std::vector<std::pair<int, int>> formula;
  // The number of formula units Z per cell; each sample draws Z in min..max with the weights of
  // the model's atom-count histogram at Z x (atoms per formula unit) (uniform when all are zero).
  int min_units = 1;
  int max_units = 1;
};

struct DeNovoTask {
  std::vector<int> allowed_elements;  // atomic numbers; empty = the model's whole vocabulary
  // Atoms per cell drawn from the model's histogram within min..max (0 = the largest count the
  // model saw); uniform over the range when the model saw none of it.
  int min_atoms = 1;
  int max_atoms = 0;
};

struct VariationTask {
  structure::Crystal structure;
  // How far to noise: the chain starts at step round(strength T) of the model's T (0 < s <= 1);
  // small values give close relatives, 1 forgets the structure entirely.
  double strength = 0.3;
  bool vary_species = false;  // absorbing models: species are noised and regenerated too
};

struct ConstrainedTask {
  structure::Crystal structure;  // the given part, e.g. a host framework
  std::vector<int> fixed_atoms;  // indices into structure: positions kept exactly
  bool fix_lattice = false;      // the cell kept exactly
  // Atoms added to the structure: atomic numbers, 0 = species generated (absorbing models).
  // Every atom of the structure that is not fixed keeps its species and gets a new position.
  std::vector<int> added_atoms;
};

struct SampleConditions {
  bool use_composition = true;  // condition on the composition when known and the model can
  int crystal_system = 0;       // 1..7 triclinic..cubic, 0 = none
  int space_group = 0;          // 1..230, 0 = none
  std::vector<std::pair<std::string, double>> properties;  // raw values by the model's names
  double guidance = 1.0;        // classifier-free guidance strength (network_denoiser.h)
};

struct SampleLimits {
  static constexpr int kDefaultMaxAtoms = 256;
  static constexpr std::int64_t kDefaultMaxCount = 100000;
  static constexpr std::int64_t kDefaultMaxEvaluations = 10000;  // network calls per sample
  static constexpr std::int64_t kDefaultMaxMemoryBytes = std::int64_t{4} << 30;
  int max_atoms = kDefaultMaxAtoms;                      // per cell
  std::int64_t max_count = kDefaultMaxCount;             // samples per call
  std::int64_t max_evaluations = kDefaultMaxEvaluations;
  std::int64_t max_memory_bytes = kDefaultMaxMemoryBytes;  // estimated before allocating
};

struct SampleJob {
  TaskKind task = TaskKind::kComposition;
  CompositionTask composition;
  DeNovoTask de_novo;
  VariationTask variation;
  ConstrainedTask constrained;
  SampleConditions conditions;
  SamplerSettings sampler;
  std::uint32_t seed = 0;
  std::uint32_t first_index = 0;
  std::uint32_t count = 1;
  int threads = 1;  // 0 = std::thread::hardware_concurrency()
  SampleLimits limits;
};

}  // namespace nucleate::sample
