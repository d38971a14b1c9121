#include "core/sample/network_denoiser.h"

#include <cmath>
#include <limits>
#include <string>

#include "core/common/error.h"
#include "core/model/graph_batch.h"

namespace nucleate::sample {

// One worker's scratch: the network's cache and output, reused across calls so that a chain of
// a thousand steps allocates once.
struct NetworkDenoiser::Workspace {
  std::vector<model::NoisyCell> cells{1};
  model::DenoiserCache<float> cache;
  model::DenoiserOutput<float> output;
  Prediction unconditional;
};

NetworkDenoiser::NetworkDenoiser(const model::ModelBundle& bundle,
                                 const model::DiffusionProcess& process, double guidance,
                                 int workers)
    : bundle_(bundle), process_(process), net_(bundle.architecture), guidance_(guidance) {
  if (net_.layout().size() != bundle.values.size()) {
    throw InvalidArgument("model", "holds " + std::to_string(bundle.values.size()) +
                                       " values; its architecture needs " +
                                       std::to_string(net_.layout().size()));
  }
  if (!(guidance >= 0) || !std::isfinite(guidance)) {
    throw InvalidArgument("conditions.guidance",
                          "must be finite and >= 0 (0 unconditional, 1 conditional)");
  }
  for (int k = 0; k < 6; ++k) {
    statistics_.mean[k] = bundle.normalisation.lattice_mean[k];
    statistics_.std[k] = bundle.normalisation.lattice_std[k];
  }
  for (int w = 0; w < std::max(workers, 1); ++w) workspaces_.push_back(std::make_unique<Workspace>());
}

NetworkDenoiser::~NetworkDenoiser() = default;

void NetworkDenoiser::Evaluate(const ChainState& state, bool conditional, long long t,
                               Workspace& w, Prediction* out) const {
  const model::Architecture& a = bundle_.architecture;
  const int n = static_cast<int>(state.frac.size());
  model::NoisyCell& cell = w.cells[0];
  cell.lattice = model::FeaturesToLattice(statistics_.Unstandardise(state.lattice), n);
  for (int k = 0; k < 6; ++k) cell.lattice_features[k] = state.lattice[k];
  cell.frac = state.frac;
  cell.tokens = state.tokens;
  cell.time = static_cast<double>(t) / static_cast<double>(process_.steps());
  cell.conditions = model::CellConditions{};
  cell.conditions.properties.assign(a.properties.size(), std::numeric_limits<double>::quiet_NaN());
  if (conditional) {
    const ChainConditions& c = state.conditions;
    if (a.condition_composition) cell.conditions.composition = c.composition;
    if (a.condition_crystal_system) cell.conditions.crystal_system = c.crystal_system;
    if (a.condition_space_group) cell.conditions.space_group = c.space_group;
    if (!c.properties.empty()) cell.conditions.properties = c.properties;
  }
  // One cell per network call: a sample's prediction then never depends on which other samples
  // run beside it (core/sample/DESIGN.md, "Reproducibility").
  const model::GraphBatch<float> batch = model::BuildGraphBatch<float>(a, w.cells);
  net_.Forward<float>(batch, bundle_.values.data(), &w.output, &w.cache);
  const double scale = process_.score_scale(t);
  out->score = w.output.coordinate_score.cast<double>() * scale;
  for (int k = 0; k < 6; ++k) out->lattice_noise[k] = w.output.lattice_noise(0, k);
  if (w.output.species_logits.size() > 0) {
    out->species_logits = w.output.species_logits.cast<double>();
  } else {
    out->species_logits.resize(0, 0);
  }
}

void NetworkDenoiser::Predict(const ChainState& state, long long t, int worker,
                              Prediction* out) const {
  Workspace& w = *workspaces_[worker];
  const ChainConditions& c = state.conditions;
  bool any_condition = !c.composition.empty() || c.crystal_system != 0 || c.space_group != 0;
  for (double p : c.properties) any_condition = any_condition || !std::isnan(p);
  if (!any_condition || guidance_ == 1.0) {
    Evaluate(state, true, t, w, out);
    return;
  }
  if (guidance_ == 0.0) {
    Evaluate(state, false, t, w, out);
    return;
  }
  Evaluate(state, false, t, w, &w.unconditional);
  Evaluate(state, true, t, w, out);
  const Prediction& u = w.unconditional;
  const double g = guidance_;
  out->score = u.score + g * (out->score - u.score);
  out->lattice_noise = u.lattice_noise + g * (out->lattice_noise - u.lattice_noise);
  if (out->species_logits.size() > 0) {
    out->species_logits = u.species_logits + g * (out->species_logits - u.species_logits);
  }
}

}  // namespace nucleate::sample
