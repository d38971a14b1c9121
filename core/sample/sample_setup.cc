#include "core/sample/sample_setup.h"

#include <algorithm>
#include <cmath>
#include <limits>
#include <set>
#include <string>

#include "core/common/error.h"
#include "core/elements/elements.h"
#include "core/random/random_stream.h"
#include "core/symmetry/symmetry.h"

namespace nucleate::sample {
namespace {

using random::Purpose;
using random::RandomStream;

std::string Index(const std::string& field, std::size_t k) {
  return field + "[" + std::to_string(k) + "]";
}

double Wrap(double f) {
  f -= std::floor(f);
  return f >= 1.0 ? 0.0 : f;
}

void CheckAtoms(long long atoms, const SampleLimits& limits, const std::string& field) {
  if (atoms > limits.max_atoms) {
    throw LimitExceeded("limits.max_atoms", field + " asks for cells of up to " +
                                                std::to_string(atoms) + " atoms; the limit is " +
                                                std::to_string(limits.max_atoms));
  }
}

// Index drawn with the given weights (uniform when they are all zero).
int DrawWeighted(const std::vector<double>& weights, double u) {
  double total = 0;
  for (double w : weights) total += w;
  if (total <= 0) {
    return std::min(static_cast<int>(u * static_cast<double>(weights.size())),
                    static_cast<int>(weights.size()) - 1);
  }
  double cumulative = 0;
  int last = 0;
  for (std::size_t k = 0; k < weights.size(); ++k) {
    if (weights[k] <= 0) continue;
    last = static_cast<int>(k);
    cumulative += weights[k] / total;
    if (u < cumulative) return last;
  }
  return last;
}

}  // namespace

SampleSetup::SampleSetup(const model::ModelBundle& bundle, const std::vector<ReverseLevel>& levels,
                         const SampleJob& job)
    : bundle_(bundle), levels_(levels), job_(job) {
  const model::Architecture& a = bundle.architecture;
  for (int k = 0; k < 6; ++k) {
    statistics_.mean[k] = bundle.normalisation.lattice_mean[k];
    statistics_.std[k] = bundle.normalisation.lattice_std[k];
  }
  const bool absorbing = a.species_mode == model::SpeciesMode::kAbsorbing;
  const SampleLimits& limits = job.limits;
  if (limits.max_atoms < 1) throw InvalidArgument("limits.max_atoms", "must be >= 1");

  // Conditions.
  const SampleConditions& c = job.conditions;
  if (c.crystal_system < 0 || c.crystal_system > 7) {
    throw InvalidArgument("conditions.crystal_system", "must be 0 (none) or 1..7");
  }
  if (c.crystal_system != 0 && !a.condition_crystal_system) {
    throw InvalidArgument("conditions.crystal_system", "the model was not trained with this condition");
  }
  if (c.space_group < 0 || c.space_group > 230) {
    throw InvalidArgument("conditions.space_group", "must be 0 (none) or 1..230");
  }
  if (c.space_group != 0 && !a.condition_space_group) {
    throw InvalidArgument("conditions.space_group", "the model was not trained with this condition");
  }
  if (!(c.guidance >= 0) || !std::isfinite(c.guidance)) {
    throw InvalidArgument("conditions.guidance", "must be finite and >= 0 (0 unconditional, 1 conditional)");
  }
  properties_.assign(a.properties.size(), std::numeric_limits<double>::quiet_NaN());
  for (const auto& [name, value] : c.properties) {
    const auto p = std::find(a.properties.begin(), a.properties.end(), name);
    if (p == a.properties.end()) {
      std::string known;
      for (const auto& n : a.properties) known += (known.empty() ? "" : ", ") + n;
      throw InvalidArgument("conditions.properties." + name,
                            "the model has no such property (it knows: " +
                                (known.empty() ? std::string("none") : known) + ")");
    }
    if (!std::isfinite(value)) throw InvalidArgument("conditions.properties." + name, "not finite");
    const std::size_t k = static_cast<std::size_t>(p - a.properties.begin());
    properties_[k] = (value - bundle.normalisation.property_mean[k]) / bundle.normalisation.property_std[k];
  }

  switch (job.task) {
    case TaskKind::kComposition: {
      const CompositionTask& t = job.composition;
      if (t.formula.empty()) throw InvalidArgument("composition.formula", "is empty");
      long long per_unit = 0;
      for (std::size_t k = 0; k < t.formula.size(); ++k) {
        // The formula is one string in the request: the message names the element.
        Token(t.formula[k].first, "composition.formula");
        if (t.formula[k].second < 1) {
          throw InvalidArgument("composition.formula",
                                elements::Describe(t.formula[k].first) + ": count must be >= 1");
        }
        per_unit += t.formula[k].second;
      }
      if (t.min_units < 1 || t.max_units < t.min_units) {
        throw InvalidArgument("composition.min_formula_units",
                              "needs 1 <= min_formula_units <= max_formula_units");
      }
      CheckAtoms(per_unit * t.max_units, limits, "composition");
      max_atoms_ = static_cast<int>(per_unit * t.max_units);
      break;
    }
    case TaskKind::kDeNovo: {
      const DeNovoTask& t = job.de_novo;
      if (!absorbing) {
        throw InvalidArgument("task", "de novo generation needs a model trained with generated "
                                      "species (species: absorbing); this one takes them as given");
      }
      if (!t.allowed_elements.empty()) {
        allowed_.assign(a.elements.size(), 0);
        for (std::size_t k = 0; k < t.allowed_elements.size(); ++k) {
          allowed_[Token(t.allowed_elements[k], Index("de_novo.allowed_elements", k))] = 1;
        }
      }
      const int seen = static_cast<int>(bundle.atom_counts.overall.size()) - 1;
      const int top = t.max_atoms > 0 ? t.max_atoms : seen;
      if (t.min_atoms < 1 || top < t.min_atoms) {
        throw InvalidArgument("de_novo.min_atoms",
                              "needs 1 <= min_atoms <= max_atoms (max_atoms 0 = the largest cell "
                              "the model saw, " + std::to_string(seen) + " atoms)");
      }
      CheckAtoms(top, limits, "de_novo");
      max_atoms_ = top;
      break;
    }
    case TaskKind::kVariation: {
      const VariationTask& t = job.variation;
      if (t.structure.size() == 0) throw InvalidArgument("variation.structure", "has no atoms");
      if (!(t.strength > 0 && t.strength <= 1)) {
        throw InvalidArgument("variation.strength", "must lie in (0, 1]");
      }
      if (t.vary_species && !absorbing) {
        throw InvalidArgument("variation.vary_species", "needs a model with generated species");
      }
      CheckAtoms(static_cast<long long>(t.structure.size()), limits, "variation.structure");
      for (std::size_t i = 0; i < t.structure.size(); ++i) {
        Token(t.structure.numbers[i], Index("variation.structure.atomic_numbers", i));
      }
      // The network learned Niggli-reduced cells (core/train/data); a variation changes the cell
      // anyway, so it starts from the reduced one.
      given_ = symmetry::NiggliReduce(t.structure);
      model::LatticeToFeatures(given_.lattice, static_cast<int>(given_.size()));
      max_atoms_ = static_cast<int>(given_.size());
      break;
    }
    case TaskKind::kConstrained: {
      const ConstrainedTask& t = job.constrained;
      const std::size_t n = t.structure.size();
      CheckAtoms(static_cast<long long>(n + t.added_atoms.size()), limits, "constrained");
      for (std::size_t i = 0; i < n; ++i) {
        Token(t.structure.numbers[i], Index("constrained.structure.atomic_numbers", i));
      }
      std::set<int> fixed;
      for (std::size_t k = 0; k < t.fixed_atoms.size(); ++k) {
        const int i = t.fixed_atoms[k];
        if (i < 0 || static_cast<std::size_t>(i) >= n) {
          throw InvalidArgument(Index("constrained.fixed_atoms", k),
                                "atom " + std::to_string(i) + " is not in the structure (" +
                                    std::to_string(n) + " atoms)");
        }
        if (!fixed.insert(i).second) {
          throw InvalidArgument(Index("constrained.fixed_atoms", k),
                                "atom " + std::to_string(i) + " is listed twice");
        }
      }
      for (std::size_t k = 0; k < t.added_atoms.size(); ++k) {
        const int z = t.added_atoms[k];
        if (z == 0 && !absorbing) {
          throw InvalidArgument(Index("constrained.added_atoms", k),
                                "0 (species generated) needs a model with generated species");
        }
        if (z != 0) Token(z, Index("constrained.added_atoms", k));
      }
      if (n + t.added_atoms.size() == 0) throw InvalidArgument("constrained.structure", "has no atoms");
      if (fixed.size() == n && t.added_atoms.empty() && t.fix_lattice) {
        throw InvalidArgument("constrained", "every atom and the lattice are fixed: nothing to generate");
      }
      given_ = t.structure;
      if (t.fix_lattice) {
        model::LatticeToFeatures(given_.lattice, static_cast<int>(n + t.added_atoms.size()));
      }
      max_atoms_ = static_cast<int>(n + t.added_atoms.size());
      break;
    }
  }
}

int SampleSetup::Token(int atomic_number, const std::string& field) const {
  const int token = bundle_.architecture.token_of(atomic_number);
  if (token < 0) {
    throw InvalidArgument(field, elements::Describe(atomic_number) +
                                     " is not in the model's vocabulary (" +
                                     std::to_string(bundle_.architecture.elements.size()) +
                                     " elements)");
  }
  return token;
}

int SampleSetup::DrawAtoms(std::uint32_t index, int* formula_units) const {
  RandomStream stream(job_.seed, index, 0, Purpose::kSampleAtomCount);
  const auto& h = bundle_.atom_counts;
  const int system = job_.conditions.crystal_system;
  const std::vector<std::uint64_t>& histogram =
      system > 0 && !h.by_crystal_system[system - 1].empty() ? h.by_crystal_system[system - 1]
                                                             : h.overall;
  const auto count = [&](long long n) {
    return n >= 0 && n < static_cast<long long>(histogram.size())
               ? static_cast<double>(histogram[static_cast<std::size_t>(n)])
               : 0.0;
  };
  if (job_.task == TaskKind::kComposition) {
    const CompositionTask& t = job_.composition;
    long long per_unit = 0;
    for (const auto& [z, n] : t.formula) per_unit += n;
    std::vector<double> weights;
    for (int units = t.min_units; units <= t.max_units; ++units) weights.push_back(count(units * per_unit));
    *formula_units = t.min_units + DrawWeighted(weights, stream.Uniform());
    return static_cast<int>(*formula_units * per_unit);
  }
  const DeNovoTask& t = job_.de_novo;
  std::vector<double> weights;
  for (int n = t.min_atoms; n <= max_atoms_; ++n) weights.push_back(count(n));
  return t.min_atoms + DrawWeighted(weights, stream.Uniform());
}

ChainConditions SampleSetup::Conditions(const std::vector<int>& tokens) const {
  ChainConditions c;
  c.crystal_system = job_.conditions.crystal_system;
  c.space_group = job_.conditions.space_group;
  c.properties = properties_;
  const int mask = bundle_.architecture.mask_token();
  const bool known = !tokens.empty() && std::none_of(tokens.begin(), tokens.end(),
                                                     [&](int t) { return t == mask; });
  if (job_.conditions.use_composition && known && bundle_.architecture.condition_composition) {
    c.composition.assign(bundle_.architecture.elements.size(), 0.0);
    for (int t : tokens) c.composition[t] += 1.0 / static_cast<double>(tokens.size());
  }
  return c;
}

SampleStart SampleSetup::Start(std::uint32_t index) const {
  const model::Architecture& a = bundle_.architecture;
  const bool absorbing = a.species_mode == model::SpeciesMode::kAbsorbing;
  const int mask = a.mask_token();
  SampleStart s;
  ChainConstraints& c = s.constraints;
  std::vector<int> clean;  // the species each atom will have (mask = generated)
  std::vector<Eigen::Vector3d> given_frac;
  switch (job_.task) {
    case TaskKind::kComposition: {
      int units = 0;
      DrawAtoms(index, &units);
      for (int u = 0; u < units; ++u) {
        for (const auto& [z, n] : job_.composition.formula) clean.insert(clean.end(), n, Token(z, ""));
      }
      break;
    }
    case TaskKind::kDeNovo: {
      int unused = 0;
      clean.assign(DrawAtoms(index, &unused), mask);
      c.allowed_elements = allowed_;
      break;
    }
    case TaskKind::kVariation:
      for (int z : given_.numbers) clean.push_back(Token(z, ""));
      break;
    case TaskKind::kConstrained:
      for (int z : given_.numbers) clean.push_back(Token(z, ""));
      for (int z : job_.constrained.added_atoms) clean.push_back(z == 0 ? mask : Token(z, ""));
      break;
  }
  const int n = static_cast<int>(clean.size());
  ChainState& state = s.state;
  state.conditions = Conditions(clean);

  // The prior: standard normal lattice features, uniform coordinates (the wrapped normal at
  // sigma_max is within a total-variation distance of about 1e-4 of uniform), every generated
  // species masked.
  RandomStream prior(job_.seed, index, 0, Purpose::kSamplePrior);
  for (int k = 0; k < 6; ++k) state.lattice[k] = prior.Normal();
  state.frac.resize(n);
  for (auto& f : state.frac) f = Eigen::Vector3d(prior.Uniform(), prior.Uniform(), prior.Uniform());
  state.tokens = clean;
  // Given species of an absorbing model are kept by replacement (they are masked as often as the
  // forward process would mask them); a composition-given model takes them as inputs.
  if (absorbing) {
    c.known_species.assign(n, 0);
    c.clean_tokens = clean;
    for (int i = 0; i < n; ++i) c.known_species[i] = clean[i] != mask;
  }

  if (job_.task == TaskKind::kVariation) {
    // Start from the structure noised to round(strength T) by the forward process.
    const long long start = std::max<long long>(
        1, std::llround(job_.variation.strength * static_cast<double>(levels_.front().t)));
    s.first_level = FirstLevelAtOrBelow(levels_, start);
    const ReverseLevel& level = levels_[s.first_level];
    const model::LatticeFeatures z0 =
        statistics_.Standardise(model::LatticeToFeatures(given_.lattice, n));
    state.lattice = std::sqrt(level.lattice.alpha_bar) * z0 +
                    std::sqrt(1 - level.lattice.alpha_bar) * state.lattice;
    RandomStream noise(job_.seed, index, static_cast<std::uint32_t>(level.t), Purpose::kSamplePrior);
    for (int i = 0; i < n; ++i) {
      for (int k = 0; k < 3; ++k) state.frac[i][k] = Wrap(given_.frac[i][k] + level.sigma * noise.Normal());
    }
    if (job_.variation.vary_species) {
      c.known_species.clear();
      state.conditions.composition.clear();  // the species are not known any more
      for (int i = 0; i < n; ++i) {
        if (noise.Uniform() >= level.kept) state.tokens[i] = mask;
      }
    }
    return s;
  }
  if (job_.task == TaskKind::kConstrained) {
    const ConstrainedTask& t = job_.constrained;
    c.fixed_atom.assign(n, 0);
    c.clean_frac.assign(n, Eigen::Vector3d::Zero());
    for (int i : t.fixed_atoms) {
      c.fixed_atom[i] = 1;
      c.clean_frac[i] = given_.frac[i];
    }
    if (t.fix_lattice) {
      c.fixed_lattice = true;
      c.clean_lattice = statistics_.Standardise(model::LatticeToFeatures(given_.lattice, n));
      s.keep_lattice = true;
      s.lattice = given_.lattice;
    }
  }
  const ReverseLevel& top = levels_.front();
  ImposeConstraints(c, top.lattice.alpha_bar, top.sigma, top.kept, {job_.seed, index}, top.t, mask,
                    &state);
  return s;
}

}  // namespace nucleate::sample
