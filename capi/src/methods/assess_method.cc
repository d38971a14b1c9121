#include "methods/assess_method.h"

#include <string>
#include <vector>

#include "core/assess/assessment.h"
#include "core/assess/held_out_split.h"
#include "core/common/error.h"
#include "core/train/train_config.h"
#include "methods/match_methods.h"
#include "methods/requested_model.h"
#include "methods/sample_method.h"
#include "methods/structure_inputs.h"
#include "nucleate/v1/assess.pb.h"

namespace nucleate::capi {
namespace {

// Request fields -> settings; what is left out keeps core's default.
assess::AssessSettings SettingsFromRequest(const v1::AssessRequest& r) {
  assess::AssessSettings s;
  if (r.has_compositions()) s.compositions = r.compositions();
  if (r.has_candidates_per_composition()) {
    s.candidates_per_composition = r.candidates_per_composition();
  }
  s.de_novo_count = r.de_novo_count();
  s.sampler = SamplerFromMessage(r.sampler());
  s.seed = r.seed();
  if (r.has_threads()) s.threads = r.threads();
  if (r.has_min_distance()) s.min_distance = r.min_distance();
  if (r.has_symprec()) s.symprec = r.symprec();
  s.tolerances = TolerancesFromMessage(r.tolerances());
  s.limits = LimitsFromMessage(r.limits());
  assess::ValidateAssessSettings(s);
  return s;
}

// The structure limits live in field structure_limits (FromMessage names "limits.<field>").
InputLimits StructureLimitsFromRequest(const v1::AssessRequest& r) {
  try {
    return FromMessage(r.structure_limits());
  } catch (const Error& e) {
    const std::string prefix = "limits.";
    if (e.field().rfind(prefix, 0) != 0) throw;
    throw Error(e.kind(), "structure_limits." + e.field().substr(prefix.size()), e.detail());
  }
}

// Every structure of a repeated field, each well formed, or the request is refused naming the
// first bad one ("held_out[2].structure.lattice").
std::vector<structure::Crystal> ReadAll(
    const google::protobuf::RepeatedPtrField<v1::StructureInput>& inputs, const InputLimits& limits,
    const std::string& field) {
  std::vector<structure::Crystal> out;
  for (InputStructure& entry : ReadInputs(inputs, limits, field)) {
    RequireValid(&entry, limits.structure);
    if (entry.error) throw *entry.error;
    entry.crystal->label = entry.source;
    out.push_back(std::move(*entry.crystal));
  }
  return out;
}

void ToMessage(const assess::Fraction& f, v1::AssessFraction* m) {
  m->set_count(f.count);
  m->set_total(f.total);
  m->set_value(f.value());
}

void ToMessage(const assess::Mean& mean, v1::AssessMean* m) {
  m->set_value(mean.value);
  m->set_sample_size(mean.sample_size);
}

void ToMessage(const assess::Distance& d, v1::AssessDistance* m) {
  m->set_value(d.value);
  m->set_candidates(d.candidates);
  m->set_reference(d.reference);
}

void ToMessage(const assess::CandidateFigures& f, v1::AssessCandidateFigures* m) {
  m->set_requested(f.requested);
  m->set_finished(f.finished);
  m->set_failed(f.failed);
  ToMessage(f.valid, m->mutable_valid());
  ToMessage(f.charge_neutral, m->mutable_charge_neutral());
  m->set_charge_not_applicable(f.charge_not_applicable);
  ToMessage(f.symmetric, m->mutable_symmetric());
  ToMessage(f.unique, m->mutable_unique());
  ToMessage(f.novel, m->mutable_novel());
  ToMessage(f.density, m->mutable_density());
  ToMessage(f.element_count, m->mutable_element_count());
}

void ToMessage(const assess::Assessment& a, v1::AssessReply* m) {
  m->set_held_out_structures(a.held_out_structures);
  m->set_held_out_compositions(a.held_out_compositions);
  m->set_training_structures(a.training_structures);
  m->set_candidates_per_composition(a.candidates_per_composition);
  ToMessage(a.matched_first, m->mutable_matched_first());
  ToMessage(a.matched_any, m->mutable_matched_any());
  ToMessage(a.first_rms, m->mutable_first_rms());
  ToMessage(a.best_rms, m->mutable_best_rms());
  ToMessage(a.prediction, m->mutable_prediction());
  for (const assess::CompositionRow& row : a.compositions) {
    v1::AssessComposition* out = m->add_compositions();
    out->set_formula(row.formula);
    out->set_formula_units(row.formula_units);
    out->set_atoms(row.atoms);
    out->set_target(row.target);
    out->set_finished(row.finished);
    out->set_failed(row.failed);
    out->set_matches(row.matches);
    out->set_matched_first(row.matched_first);
    out->set_matched_any(row.matched_any);
    out->set_first_rms(row.first_rms);
    out->set_best_rms(row.best_rms);
    out->set_unique(row.unique);
  }
  for (const assess::SkippedComposition& skipped : a.skipped) {
    v1::AssessSkipped* out = m->add_skipped();
    out->set_formula(skipped.formula);
    out->set_reason(skipped.reason);
  }
  m->set_de_novo_run(a.de_novo_run);
  ToMessage(a.de_novo, m->mutable_de_novo());
  for (const std::string& note : a.notes) m->add_notes(note);
  m->set_cancelled(a.cancelled);
  m->set_evaluations(a.evaluations);
}

void HandleAssess(const v1::AssessRequest& request, v1::AssessReply* reply,
                  const CallContext& context) {
  if (request.model_path().empty()) {
    throw InvalidArgument("model_path", "required: the model file to assess");
  }
  const bool from_config = !request.config_yaml().empty();
  if (from_config && request.held_out_size() > 0) {
    throw InvalidArgument("held_out",
                          "give either config_yaml (the split is rebuilt from it) or "
                          "held_out structures, not both");
  }
  if (!from_config && request.held_out_size() == 0) {
    throw InvalidArgument("config_yaml",
                          "required: the model's training configuration, or "
                          "held_out structures");
  }
  if (from_config && request.training_size() > 0) {
    throw InvalidArgument("training",
                          "comes from the configuration's training split; give "
                          "training structures only with held_out");
  }
  // Everything a request can get wrong is checked before the model or the data are read.
  const assess::AssessSettings settings = SettingsFromRequest(request);
  const InputLimits limits = StructureLimitsFromRequest(request);

  assess::AssessData data;
  train::TrainSettings config;
  if (from_config) {
    const std::string name = request.config_name().empty() ? "config" : request.config_name();
    config = train::ReadTrainConfig(request.config_yaml(), request.config_directory(), name);
  } else {
    data.held_out = ReadAll(request.held_out(), limits, "held_out");
    data.training = ReadAll(request.training(), limits, "training");
  }
  const model::ModelBundle bundle = LoadRequestedModel(request.model_path(), "model_path");
  if (from_config) {
    assess::RebuiltSplit split = assess::RebuildSplit(config, bundle);
    context.Log(
        NUCLEATE_LOG_INFO,
        "split rebuilt from " +
            (request.config_name().empty() ? std::string("config") : request.config_name()) + ": " +
            std::to_string(split.data.held_out.size()) + " held out (test), " +
            std::to_string(split.data.training.size()) + " training, " +
            std::to_string(split.validation_structures) + " validation (unused); " +
            (split.hash_verified ? "dataset hash verified"
                                 : "the model records no dataset hash to verify"));
    reply->set_dataset_hash(split.dataset_hash);
    data = std::move(split.data);
  }
  reply->set_caution(CandidateCaution());
  const assess::Assessment assessment =
      assess::Assess(bundle, data, settings, [&](std::int64_t done, std::int64_t total) {
        return context.ReportProgress(static_cast<double>(done) / static_cast<double>(total),
                                      "assess");
      });
  ToMessage(assessment, reply);
}

}  // namespace

MethodEntry AssessMethod() {
  return MakeMethod<v1::AssessRequest, v1::AssessReply, &HandleAssess>("Assess");
}

}  // namespace nucleate::capi
