#include "methods/model_methods.h"

#include <filesystem>
#include <string>

#include "core/common/error.h"
#include "core/model/bundle/bundle_file.h"
#include "core/model/bundle/bundle_messages.h"
#include "core/model/bundle/model_bundle.h"
#include "core/train/train_config.h"
#include "core/train/trainer.h"
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
  const train::TrainResult r = train::Train(settings, observer, log);

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
  const model::ModelBundle bundle = model::LoadModelBundle(request.path());
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

}  // namespace

MethodEntry TrainMethod() {
  return MakeMethod<v1::TrainRequest, v1::TrainReply, &HandleTrain>("Train");
}

MethodEntry ModelInfoMethod() {
  return MakeMethod<v1::ModelInfoRequest, v1::ModelInfoReply, &HandleModelInfo>("ModelInfo");
}

}  // namespace nucleate::capi
