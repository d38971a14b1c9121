#include "methods/model_methods.h"

#include <filesystem>
#include <map>
#include <string>

#include "core/common/error.h"
#include "core/model/bundle/bundle_file.h"
#include "core/model/bundle/bundle_messages.h"
#include "core/model/bundle/model_bundle.h"
#include "core/model/evaluate.h"
#include "core/structure/validate.h"
#include "core/train/train_config.h"
#include "core/train/trainer.h"
#include "methods/requested_model.h"
#include "methods/structure_inputs.h"
#include "nucleate/v1/evaluate.pb.h"
#include "nucleate/v1/model.pb.h"
#include "nucleate/v1/train.pb.h"

namespace nucleate::capi {
namespace {

void HandleTrain(const v1::TrainRequest& request, v1::TrainReply* reply,
                 const CallContext& context) {
  const std::string name = request.config_name().empty() ? "config" : request.config_name();
  const train::TrainSettings settings =
      train::ReadTrainConfig(request.config_yaml(), request.config_directory(), name);
  const auto observer = [&](const train::TrainProgress& p) {
    const double fraction = p.total_steps > 0 ? double(p.step) / double(p.total_steps) : 1.0;
    return context.ReportProgress(fraction, "train");
  };
  const auto log = [&](const std::string& line) { context.Log(NUCLEATE_LOG_INFO, line); };
  train::ProcessGroup group;
  if (const nucleate_collective_v1* c = context.collective()) {
    group.rank = c->rank;
    group.size = c->size;
    group.sum = [c](std::vector<double>* values) {
      const int32_t code =
          c->sum_doubles(values->data(), static_cast<int64_t>(values->size()), c->context);
      if (code != 0) {
        throw Error(ErrorKind::kCollective, "collective.sum_doubles",
                    "the caller's sum failed with code " + std::to_string(code) + " on process " +
                        std::to_string(c->rank));
      }
    };
  }
  const train::TrainResult r = train::Train(settings, observer, log, group);

  const auto& report = r.data_report;
  reply->set_structures_kept(report.structures_kept);
  reply->set_structures_skipped(report.structures_skipped);
  reply->set_files_skipped(report.files_skipped);
  for (const auto& p : report.problems) {
    v1::DatasetProblem* out = reply->add_problems();
    out->set_source(p.source);
    out->set_reason(p.reason);
  }
  reply->set_problems_not_listed(report.problems_not_listed);
  reply->set_train_count(r.train_count);
  reply->set_validation_count(r.validation_count);
  reply->set_test_count(r.test_count);
  reply->set_validation_unscorable(r.validation_unscorable);
  reply->set_parameters(r.parameters);
  reply->set_epochs_done(r.epochs_done);
  reply->set_steps_done(r.steps_done);
  for (double loss : r.validation_losses) reply->add_validation_losses(loss);
  reply->set_last_loss(r.last_loss);
  reply->set_resumed(r.resumed);
  reply->set_cancelled(r.cancelled);
  reply->set_dataset_hash(r.dataset_hash);
  reply->set_model_path(settings.output.model);
}

void HandleModelInfo(const v1::ModelInfoRequest& request, v1::ModelInfoReply* reply,
                     const CallContext&) {
  if (request.path().empty()) throw InvalidArgument("path", "required: the model file to describe");
  const model::ModelBundle bundle = LoadRequestedModel(request.path(), "path");
  v1::ModelBundle message;
  model::ToMessage(bundle, &message);
  reply->set_format_version(message.format_version());
  *reply->mutable_architecture() = message.architecture();
  *reply->mutable_schedules() = message.schedules();
  *reply->mutable_provenance() = message.provenance();
  reply->set_parameters(static_cast<std::int64_t>(bundle.values.size()));
  for (const auto& tensor : bundle.layout.tensors()) {
    v1::ModelTensorShape* out = reply->add_tensors();
    out->set_name(tensor.name);
    out->set_rows(tensor.rows);
    out->set_cols(tensor.cols);
  }
  std::error_code error;
  const auto size = std::filesystem::file_size(request.path(), error);
  if (!error) reply->set_file_bytes(size);
}

void HandleEvaluate(const v1::EvaluateRequest& request, v1::EvaluateReply* reply,
                    const CallContext&) {
  if (request.model_path().empty()) {
    throw InvalidArgument("model_path", "required: the model file to evaluate");
  }
  const InputLimits limits = FromMessage(request.limits());
  if (request.cells_size() > limits.max_structures) {
    throw LimitExceeded("cells", std::to_string(request.cells_size()) + " cells; limits.max_structures is " +
                                     std::to_string(limits.max_structures));
  }
  std::vector<model::EvaluationInput> inputs;
  for (int i = 0; i < request.cells_size(); ++i) {
    const v1::EvaluateCell& m = request.cells(i);
    const std::string field = "cells[" + std::to_string(i) + "]";
    model::EvaluationInput in;
    try {
      in.cell = FromMessage(m.structure(), limits.structure);
      // The network's neighbour search needs a sane cell: refuse what Check would report.
      structure::ValidateCrystal(in.cell, limits.structure);
    } catch (const Error& e) {
      throw e.WithinField(field + ".structure");
    }
    in.step = m.step();
    in.masked.assign(m.masked().begin(), m.masked().end());
    in.composition_known = m.composition_known();
    in.crystal_system = m.crystal_system();
    in.space_group = m.space_group();
    // Sorted by name, so the order never depends on the map's iteration order.
    std::map<std::string, double> sorted(m.properties().begin(), m.properties().end());
    in.properties.assign(sorted.begin(), sorted.end());
    inputs.push_back(std::move(in));
  }
  const model::ModelBundle bundle = LoadRequestedModel(request.model_path(), "model_path");
  for (const model::EvaluationOutput& out : model::EvaluateModel(bundle, inputs)) {
    v1::EvaluateOutput* o = reply->add_outputs();
    for (int i = 0; i < out.coordinate_score.rows(); ++i) {
      for (int k = 0; k < 3; ++k) o->add_coordinate_score(out.coordinate_score(i, k));
    }
    for (int k = 0; k < 6; ++k) o->add_lattice_noise(out.lattice_noise[k]);
    for (int i = 0; i < out.species_logits.rows(); ++i) {
      for (int k = 0; k < out.species_logits.cols(); ++k) o->add_species_logits(out.species_logits(i, k));
    }
  }
  for (int z : bundle.architecture.elements) reply->add_elements(z);
}

}  // namespace

MethodEntry TrainMethod() {
  MethodEntry entry = MakeMethod<v1::TrainRequest, v1::TrainReply, &HandleTrain>("Train");
  entry.spans_processes = true;  // data-parallel: each process its share of every batch
  return entry;
}

MethodEntry EvaluateMethod() {
  return MakeMethod<v1::EvaluateRequest, v1::EvaluateReply, &HandleEvaluate>("Evaluate");
}

MethodEntry ModelInfoMethod() {
  return MakeMethod<v1::ModelInfoRequest, v1::ModelInfoReply, &HandleModelInfo>("ModelInfo");
}

}  // namespace nucleate::capi
