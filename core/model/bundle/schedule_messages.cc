#include "core/model/bundle/schedule_messages.h"

#include <string>

#include "core/common/error.h"

namespace nucleate::model {

namespace sc = nucleate::schedule;

sc::VarianceKind VarianceKindFromMessage(v1::VarianceKind kind, const std::string& field) {
  switch (kind) {
    case v1::VARIANCE_KIND_UNSPECIFIED:
    case v1::VARIANCE_KIND_LINEAR:
      return sc::VarianceKind::kLinear;
    case v1::VARIANCE_KIND_COSINE:
      return sc::VarianceKind::kCosine;
    case v1::VARIANCE_KIND_SIGMOID:
      return sc::VarianceKind::kSigmoid;
    case v1::VARIANCE_KIND_LOG_SNR_LINEAR:
      return sc::VarianceKind::kLogSnrLinear;
    default:
      break;
  }
  throw InvalidArgument(field, "unknown variance kind " + std::to_string(kind));
}

namespace {

v1::VarianceKind ToMessage(sc::VarianceKind kind) {
  switch (kind) {
    case sc::VarianceKind::kLinear:
      return v1::VARIANCE_KIND_LINEAR;
    case sc::VarianceKind::kCosine:
      return v1::VARIANCE_KIND_COSINE;
    case sc::VarianceKind::kSigmoid:
      return v1::VARIANCE_KIND_SIGMOID;
    case sc::VarianceKind::kLogSnrLinear:
      return v1::VARIANCE_KIND_LOG_SNR_LINEAR;
  }
  throw InvalidArgument("kind", "unknown variance kind " + std::to_string(static_cast<int>(kind)));
}

}  // namespace

sc::VarianceParams FromMessage(const v1::VarianceSchedule& m) {
  sc::VarianceParams p;
  p.kind = VarianceKindFromMessage(m.kind(), "kind");
  if (m.has_steps()) p.steps = m.steps();
  if (m.has_beta_start()) p.beta_start = m.beta_start();
  if (m.has_beta_end()) p.beta_end = m.beta_end();
  if (m.has_cosine_offset()) p.cosine_offset = m.cosine_offset();
  if (m.has_max_beta()) p.max_beta = m.max_beta();
  if (m.has_sigmoid_start()) p.sigmoid_start = m.sigmoid_start();
  if (m.has_sigmoid_end()) p.sigmoid_end = m.sigmoid_end();
  if (m.has_sigmoid_tau()) p.sigmoid_tau = m.sigmoid_tau();
  if (m.has_log_snr_max()) p.log_snr_max = m.log_snr_max();
  if (m.has_log_snr_min()) p.log_snr_min = m.log_snr_min();
  if (m.has_log_snr_shift()) p.log_snr_shift = m.log_snr_shift();
  if (m.has_zero_terminal_snr()) p.zero_terminal_snr = m.zero_terminal_snr();
  if (m.has_respaced_steps()) p.respaced_steps = m.respaced_steps();
  return p;
}

void ToMessage(const sc::VarianceParams& p, v1::VarianceSchedule* m) {
  m->set_kind(ToMessage(p.kind));
  m->set_steps(p.steps);
  m->set_beta_start(p.beta_start);
  m->set_beta_end(p.beta_end);
  m->set_cosine_offset(p.cosine_offset);
  m->set_max_beta(p.max_beta);
  m->set_sigmoid_start(p.sigmoid_start);
  m->set_sigmoid_end(p.sigmoid_end);
  m->set_sigmoid_tau(p.sigmoid_tau);
  m->set_log_snr_max(p.log_snr_max);
  m->set_log_snr_min(p.log_snr_min);
  m->set_log_snr_shift(p.log_snr_shift);
  m->set_zero_terminal_snr(p.zero_terminal_snr);
  m->set_respaced_steps(p.respaced_steps);
}

sc::SigmaKind SigmaKindFromMessage(v1::SigmaKind kind, const std::string& field) {
  switch (kind) {
    case v1::SIGMA_KIND_UNSPECIFIED:
    case v1::SIGMA_KIND_GEOMETRIC:
      return sc::SigmaKind::kGeometric;
    case v1::SIGMA_KIND_KARRAS:
      return sc::SigmaKind::kKarras;
    default:
      break;
  }
  throw InvalidArgument(field, "unknown sigma kind " + std::to_string(kind));
}

sc::SigmaParams FromMessage(const v1::SigmaSchedule& m) {
  sc::SigmaParams p;
  p.kind = SigmaKindFromMessage(m.kind(), "kind");
  if (m.has_steps()) p.steps = m.steps();
  if (m.has_sigma_min()) p.sigma_min = m.sigma_min();
  if (m.has_sigma_max()) p.sigma_max = m.sigma_max();
  if (m.has_rho()) p.rho = m.rho();
  return p;
}

void ToMessage(const sc::SigmaParams& p, v1::SigmaSchedule* m) {
  m->set_kind(p.kind == sc::SigmaKind::kKarras ? v1::SIGMA_KIND_KARRAS : v1::SIGMA_KIND_GEOMETRIC);
  m->set_steps(p.steps);
  m->set_sigma_min(p.sigma_min);
  m->set_sigma_max(p.sigma_max);
  m->set_rho(p.rho);
}

sc::TransitionParams FromMessage(const v1::TransitionSchedule& m) {
  sc::TransitionParams p;
  switch (m.kind()) {
    case v1::TRANSITION_KIND_UNSPECIFIED:
    case v1::TRANSITION_KIND_ABSORBING:
      p.kind = sc::TransitionKind::kAbsorbing;
      break;
    case v1::TRANSITION_KIND_UNIFORM:
      p.kind = sc::TransitionKind::kUniform;
      break;
    default:
      throw InvalidArgument("kind", "unknown transition kind " + std::to_string(m.kind()));
  }
  switch (m.retention()) {
    case v1::RETENTION_KIND_UNSPECIFIED:
    case v1::RETENTION_KIND_RECIPROCAL:
      p.retention = sc::RetentionKind::kReciprocal;
      break;
    case v1::RETENTION_KIND_COSINE:
      p.retention = sc::RetentionKind::kCosine;
      break;
    default:
      throw InvalidArgument("retention", "unknown retention kind " + std::to_string(m.retention()));
  }
  if (m.has_steps()) p.steps = m.steps();
  p.num_classes = m.num_classes();
  if (m.has_cosine_offset()) p.cosine_offset = m.cosine_offset();
  return p;
}

void ToMessage(const sc::TransitionParams& p, v1::TransitionSchedule* m) {
  m->set_kind(p.kind == sc::TransitionKind::kUniform ? v1::TRANSITION_KIND_UNIFORM
                                                     : v1::TRANSITION_KIND_ABSORBING);
  m->set_retention(p.retention == sc::RetentionKind::kCosine ? v1::RETENTION_KIND_COSINE
                                                             : v1::RETENTION_KIND_RECIPROCAL);
  m->set_steps(p.steps);
  m->set_num_classes(p.num_classes);
  m->set_cosine_offset(p.cosine_offset);
}

}  // namespace nucleate::model
