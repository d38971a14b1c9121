#include "methods/schedule_methods.h"

#include <cmath>
#include <string>

#include "core/common/shortest_number.h"
#include "core/common/error.h"
#include "core/model/bundle/schedule_messages.h"
#include "core/schedule/designer.h"
#include "core/schedule/discrete_transitions.h"
#include "core/schedule/sigma_schedule.h"
#include "core/schedule/variance_schedule.h"
#include "core/schedule/wrapped_normal.h"
#include "methods/within_field.h"
#include "nucleate/v1/schedule.pb.h"

namespace nucleate::capi {
namespace {

// Schedule parameters <-> messages: one conversion, core's (the model bundle stores them too).
using model::FromMessage;
using model::ToMessage;

namespace sc = nucleate::schedule;

// ---- limits -----------------------------------------------------------------------------------

// Limits left out keep core's defaults; core checks floors and ceilings.
sc::ScheduleLimits FromMessage(const v1::ScheduleLimits& message) {
  sc::ScheduleLimits limits;
  if (message.has_max_steps()) limits.max_steps = message.max_steps();
  if (message.has_max_classes()) limits.max_classes = message.max_classes();
  if (message.has_max_matrix_entries()) limits.max_matrix_entries = message.max_matrix_entries();
  WithinField("limits", [&] { sc::ValidateScheduleLimits(limits); });
  return limits;
}

void ToMessage(const sc::ScheduleLimits& limits, v1::ScheduleLimits* message) {
  message->set_max_steps(limits.max_steps);
  message->set_max_classes(limits.max_classes);
  message->set_max_matrix_entries(limits.max_matrix_entries);
}

// ---- variance-preserving ----------------------------------------------------------------------

void ToMessage(const sc::VarianceStep& s, v1::VarianceStep* m) {
  m->set_t(s.t);
  m->set_source_t(s.source_t);
  m->set_beta(s.beta);
  m->set_alpha(s.alpha);
  m->set_alpha_bar(s.alpha_bar);
  m->set_sqrt_alpha_bar(s.sqrt_alpha_bar);
  m->set_sqrt_one_minus_alpha_bar(s.sqrt_one_minus_alpha_bar);
  m->set_snr(s.snr);
  m->set_log_snr(s.log_snr);
  m->set_posterior_variance(s.posterior_variance);
  m->set_posterior_log_variance_clipped(s.posterior_log_variance_clipped);
  m->set_posterior_mean_coef_x0(s.posterior_mean_coef_x0);
  m->set_posterior_mean_coef_xt(s.posterior_mean_coef_xt);
}

// ---- variance-exploding -----------------------------------------------------------------------

void ToMessage(const sc::SigmaLevel& s, v1::SigmaLevel* m) {
  m->set_t(s.t);
  m->set_sigma(s.sigma);
  m->set_tv_distance_to_uniform(s.tv_distance_to_uniform);
  m->set_images(s.truncation.images);
  m->set_density_relative_error_bound(s.truncation.density_relative_error);
  m->set_score_absolute_error_bound(s.truncation.score_absolute_error);
}

// ---- discrete ---------------------------------------------------------------------------------

void ToMessage(const sc::TransitionParams& p, bool include_matrices, v1::TransitionSchedule* m) {
  model::ToMessage(p, m);
  m->set_include_matrices(include_matrices);
}

void AppendMatrix(const Eigen::MatrixXd& matrix,
                  google::protobuf::RepeatedField<double>* out) {
  out->Reserve(static_cast<int>(matrix.size()));
  for (Eigen::Index i = 0; i < matrix.rows(); ++i) {
    for (Eigen::Index j = 0; j < matrix.cols(); ++j) out->Add(matrix(i, j));
  }
}

// ---- handlers ---------------------------------------------------------------------------------

void HandleSchedule(const v1::ScheduleRequest& request, v1::ScheduleTable* reply,
                    const CallContext&) {
  sc::ScheduleLimits limits = FromMessage(request.limits());
  ToMessage(limits, reply->mutable_resolved()->mutable_limits());
  switch (request.family_case()) {
    case v1::ScheduleRequest::kVariance:
      WithinField("variance", [&] {
        const sc::VarianceParams params = FromMessage(request.variance());
        const std::vector<sc::VarianceStep> steps = sc::BuildVarianceSchedule(params, limits);
        ToMessage(params, reply->mutable_resolved()->mutable_variance());
        reply->mutable_variance_steps()->Reserve(static_cast<int>(steps.size()));
        for (const sc::VarianceStep& step : steps) ToMessage(step, reply->add_variance_steps());
      });
      return;
    case v1::ScheduleRequest::kSigma:
      WithinField("sigma", [&] {
        const sc::SigmaParams params = FromMessage(request.sigma());
        const std::vector<sc::SigmaLevel> levels = sc::BuildSigmaSchedule(params, limits);
        ToMessage(params, reply->mutable_resolved()->mutable_sigma());
        reply->mutable_sigma_levels()->Reserve(static_cast<int>(levels.size()));
        for (const sc::SigmaLevel& level : levels) ToMessage(level, reply->add_sigma_levels());
      });
      return;
    case v1::ScheduleRequest::kTransition:
      WithinField("transition", [&] {
        const sc::TransitionParams params = FromMessage(request.transition());
        const bool with_matrices = request.transition().include_matrices();
        sc::ValidateTransitionParams(params, limits);
        const double entries = static_cast<double>(params.steps) *
                               static_cast<double>(params.num_classes) *
                               static_cast<double>(params.num_classes);
        if (with_matrices && entries > static_cast<double>(limits.max_matrix_entries)) {
          throw LimitExceeded("include_matrices",
                              "steps * num_classes^2 = " + std::to_string(entries) +
                                  " matrix entries is above limits.max_matrix_entries = " +
                                  std::to_string(limits.max_matrix_entries));
        }
        const std::vector<sc::TransitionStep> steps = sc::BuildTransitionSchedule(params, limits);
        ToMessage(params, with_matrices, reply->mutable_resolved()->mutable_transition());
        for (const sc::TransitionStep& step : steps) {
          v1::TransitionStep* row = reply->add_transition_steps();
          row->set_t(step.t);
          row->set_beta(step.beta);
          row->set_alpha_bar(step.alpha_bar);
          if (with_matrices) {
            AppendMatrix(sc::TransitionMatrix(params.kind, params.num_classes, step.beta),
                         row->mutable_matrix());
            AppendMatrix(
                sc::CumulativeTransitionMatrix(params.kind, params.num_classes, step.alpha_bar),
                row->mutable_cumulative_matrix());
          }
        }
      });
      return;
    case v1::ScheduleRequest::FAMILY_NOT_SET:
      break;
  }
  throw InvalidArgument("family", "set exactly one of variance, sigma or transition");
}

void HandleDesign(const v1::DesignRequest& request, v1::DesignReply* reply, const CallContext&) {
  const sc::ScheduleLimits limits = FromMessage(request.limits());
  sc::DesignTargets targets;
  if (request.has_steps()) targets.steps = request.steps();
  if (request.variance_kind() != v1::VARIANCE_KIND_UNSPECIFIED) {
    targets.variance_kind = model::VarianceKindFromMessage(request.variance_kind(), "variance_kind");
  }
  if (request.has_terminal_snr()) targets.terminal_snr = request.terminal_snr();
  if (request.has_initial_snr()) targets.initial_snr = request.initial_snr();
  targets.sigma_kind = model::SigmaKindFromMessage(request.sigma_kind(), "sigma_kind");
  if (request.has_tv_distance()) targets.tv_distance = request.tv_distance();
  if (request.has_resolution_angstrom()) targets.resolution_angstrom = request.resolution_angstrom();
  if (request.has_cell_length_angstrom()) {
    targets.cell_length_angstrom = request.cell_length_angstrom();
  }
  const sc::Design design = sc::DesignSchedules(targets, limits);
  ToMessage(design.variance, reply->mutable_variance());
  ToMessage(design.sigma, reply->mutable_sigma());
  v1::DesignDiagnostics* d = reply->mutable_diagnostics();
  d->set_achieved_terminal_snr(design.diagnostics.achieved_terminal_snr);
  d->set_achieved_initial_snr(design.diagnostics.achieved_initial_snr);
  d->set_max_log_snr_step(design.diagnostics.max_log_snr_step);
  d->set_tv_distance_at_sigma_max(design.diagnostics.tv_distance_at_sigma_max);
  d->set_finest_displacement_angstrom(design.diagnostics.finest_displacement_angstrom);
  d->set_coarsest_displacement_angstrom(design.diagnostics.coarsest_displacement_angstrom);
}

// Enough images for any sigma a caller would use on a unit period; the bound is reported anyway.
constexpr int kMaxImages = 1000;

void HandleWrappedNormal(const v1::WrappedNormalRequest& request, v1::WrappedNormalReply* reply,
                         const CallContext&) {
  const double sigma = request.sigma();
  if (!std::isfinite(sigma) || sigma <= 0) {
    throw InvalidArgument("sigma", "must be a finite number above 0, got " + FormatShortest(sigma));
  }
  int images = 0;
  if (request.has_images()) {
    images = request.images();
    if (images < 1) throw InvalidArgument("images", "must be at least 1, got " + std::to_string(images));
    if (images > kMaxImages) {
      throw LimitExceeded("images", std::to_string(images) + " is above the ceiling " +
                                        std::to_string(kMaxImages));
    }
  } else {
    images = std::min(sc::WrappedNormalImagesFor(sigma), kMaxImages);
  }
  for (int i = 0; i < request.x_size(); ++i) {
    if (!std::isfinite(request.x(i))) {
      throw InvalidArgument("x[" + std::to_string(i) + "]", "must be a finite number");
    }
  }
  const sc::TruncationBound bound = sc::WrappedNormalTruncationBound(sigma, images);
  reply->set_images(images);
  reply->set_density_relative_error_bound(bound.density_relative_error);
  reply->set_score_absolute_error_bound(bound.score_absolute_error);
  reply->set_tv_distance_to_uniform(sc::WrappedNormalTvDistanceToUniform(sigma));
  reply->mutable_density()->Reserve(request.x_size());
  reply->mutable_score()->Reserve(request.x_size());
  for (double x : request.x()) {
    reply->add_density(sc::WrappedNormalDensity(x, sigma, images));
    reply->add_score(sc::WrappedNormalScore(x, sigma, images));
  }
}

}  // namespace

MethodEntry ScheduleMethod() {
  return MakeMethod<v1::ScheduleRequest, v1::ScheduleTable, &HandleSchedule>("Schedule");
}
MethodEntry DesignScheduleMethod() {
  return MakeMethod<v1::DesignRequest, v1::DesignReply, &HandleDesign>("DesignSchedule");
}
MethodEntry WrappedNormalMethod() {
  return MakeMethod<v1::WrappedNormalRequest, v1::WrappedNormalReply, &HandleWrappedNormal>(
      "WrappedNormal");
}

}  // namespace nucleate::capi
