#include "core/model/evaluate.h"

#include <cmath>
#include <limits>
#include <string>

#include "core/common/error.h"
#include "core/elements/elements.h"
#include "core/model/denoiser.h"
#include "core/model/diffusion.h"
#include "core/model/graph_batch.h"
#include "core/model/lattice_features.h"

namespace nucleate::model {
namespace {

NoisyCell ToNoisyCell(const ModelBundle& b, const DiffusionProcess& process,
                      const LatticeStatistics& statistics, const EvaluationInput& in,
                      const std::string& field) {
  const Architecture& a = b.architecture;
  const int n = static_cast<int>(in.cell.size());
  if (n == 0) throw InvalidArgument(field + ".cell", "has no atoms");
  if (in.step < 1 || in.step > process.steps()) {
    throw InvalidArgument(field + ".step", "must lie in 1.." + std::to_string(process.steps()));
  }
  if (!in.masked.empty() && static_cast<int>(in.masked.size()) != n) {
    throw InvalidArgument(field + ".masked", "needs one entry per atom (" + std::to_string(n) + ")");
  }
  NoisyCell c;
  c.lattice = in.cell.lattice;
  c.frac = in.cell.frac;
  c.time = static_cast<double>(in.step) / static_cast<double>(process.steps());
  const LatticeFeatures features = statistics.Standardise(LatticeToFeatures(in.cell.lattice, n));
  for (int k = 0; k < 6; ++k) c.lattice_features[k] = features[k];
  std::vector<double> composition(a.elements.size(), 0.0);
  for (int i = 0; i < n; ++i) {
    const bool masked = !in.masked.empty() && in.masked[i];
    if (masked && a.species_mode != SpeciesMode::kAbsorbing) {
      throw InvalidArgument(field + ".masked[" + std::to_string(i) + "]",
                            "this model takes species as given; nothing can be masked");
    }
    if (masked) {
      c.tokens.push_back(a.mask_token());
      continue;
    }
    const int token = a.token_of(in.cell.numbers[i]);
    if (token < 0) {
      // The request names the cell's structure "structure" (EvaluateCell).
      throw InvalidArgument(field + ".structure.atomic_numbers[" + std::to_string(i) + "]",
                            elements::Describe(in.cell.numbers[i]) +
                                " is not in the model's vocabulary");
    }
    c.tokens.push_back(token);
    composition[token] += 1.0 / n;
  }
  if (in.composition_known && a.condition_composition) c.conditions.composition = composition;
  if (in.crystal_system < 0 || in.crystal_system > 7) {
    throw InvalidArgument(field + ".crystal_system", "must be 0 (missing) or 1..7");
  }
  if (in.space_group < 0 || in.space_group > 230) {
    throw InvalidArgument(field + ".space_group", "must be 0 (missing) or 1..230");
  }
  if (a.condition_crystal_system) c.conditions.crystal_system = in.crystal_system;
  if (a.condition_space_group) c.conditions.space_group = in.space_group;
  c.conditions.properties.assign(a.properties.size(), std::numeric_limits<double>::quiet_NaN());
  for (const auto& [name, value] : in.properties) {
    std::size_t p = 0;
    while (p < a.properties.size() && a.properties[p] != name) ++p;
    if (p == a.properties.size()) {
      throw InvalidArgument(field + ".properties." + name, "the model has no such property");
    }
    if (!std::isfinite(value)) throw InvalidArgument(field + ".properties." + name, "not finite");
    c.conditions.properties[p] =
        (value - b.normalisation.property_mean[p]) / b.normalisation.property_std[p];
  }
  return c;
}

}  // namespace

std::vector<EvaluationOutput> EvaluateModel(const ModelBundle& bundle,
                                            const std::vector<EvaluationInput>& cells) {
  const Denoiser net(bundle.architecture);
  if (net.layout().size() != bundle.values.size()) {
    throw InvalidArgument("model", "holds " + std::to_string(bundle.values.size()) +
                                       " values; its architecture needs " +
                                       std::to_string(net.layout().size()));
  }
  const DiffusionProcess process(bundle.schedules, bundle.architecture);
  LatticeStatistics statistics;
  for (int k = 0; k < 6; ++k) {
    statistics.mean[k] = bundle.normalisation.lattice_mean[k];
    statistics.std[k] = bundle.normalisation.lattice_std[k];
  }
  std::vector<NoisyCell> noisy;
  for (std::size_t i = 0; i < cells.size(); ++i) {
    const std::string field = "cells[" + std::to_string(i) + "]";
    try {
      noisy.push_back(ToNoisyCell(bundle, process, statistics, cells[i], field));
    } catch (const Error& e) {
      throw e.kind() == ErrorKind::kInvalidArgument && e.field().rfind("cells[", 0) != 0
                ? e.WithinField(field + ".cell")
                : e;
    }
  }
  std::vector<EvaluationOutput> out(cells.size());
  if (cells.empty()) return out;
  const GraphBatch<float> batch = BuildGraphBatch<float>(bundle.architecture, noisy);
  DenoiserOutput<float> result;
  net.Forward<float>(batch, bundle.values.data(), &result, nullptr);
  for (std::size_t c = 0; c < cells.size(); ++c) {
    const int begin = batch.atom_offsets[c], n = batch.atom_offsets[c + 1] - begin;
    const double scale = process.score_scale(cells[c].step);
    out[c].coordinate_score = result.coordinate_score.middleRows(begin, n).cast<double>() * scale;
    out[c].lattice_noise = result.lattice_noise.row(c).transpose().cast<double>();
    if (result.species_logits.size() > 0) {
      out[c].species_logits = result.species_logits.middleRows(begin, n).cast<double>();
    }
  }
  return out;
}

}  // namespace nucleate::model
