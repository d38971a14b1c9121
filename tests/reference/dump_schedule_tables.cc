// Writes schedule tables and wrapped-normal values computed by nucleate's core as JSON on stdout,
// for schedule_numpy_reference.py to check against its own numpy implementation. The JSON is
// written by hand (no dependency beyond nucleate_core); doubles carry 17 significant digits and
// infinities are written as Python's json module reads them (-Infinity).
#include <cmath>
#include <cstdio>
#include <functional>
#include <string>
#include <vector>

#include "core/common/error.h"
#include "core/schedule/variance_schedule.h"
#include "core/schedule/wrapped_normal.h"

namespace {

using nucleate::schedule::ScheduleLimits;
using nucleate::schedule::VarianceKind;
using nucleate::schedule::VarianceParams;
using nucleate::schedule::VarianceStep;

std::string Num(double v) {
  if (std::isnan(v)) return "NaN";
  if (std::isinf(v)) return v > 0 ? "Infinity" : "-Infinity";
  char buf[40];
  std::snprintf(buf, sizeof buf, "%.17g", v);
  return buf;
}

template <typename T, typename Get>
std::string Array(const std::vector<T>& rows, Get get) {
  std::string out = "[";
  for (size_t i = 0; i < rows.size(); ++i) {
    if (i) out += ",";
    out += Num(static_cast<double>(get(rows[i])));
  }
  return out + "]";
}

const char* KindName(VarianceKind kind) {
  switch (kind) {
    case VarianceKind::kLinear: return "linear";
    case VarianceKind::kCosine: return "cosine";
    case VarianceKind::kSigmoid: return "sigmoid";
    case VarianceKind::kLogSnrLinear: return "log_snr_linear";
  }
  return "unknown";
}

std::string TableJson(const std::string& name, const VarianceParams& p) {
  const std::vector<VarianceStep> rows =
      nucleate::schedule::BuildVarianceSchedule(p, ScheduleLimits{});
  std::string out = "{\"name\":\"" + name + "\",\"params\":{";
  out += "\"kind\":\"" + std::string(KindName(p.kind)) + "\"";
  out += ",\"steps\":" + std::to_string(p.steps);
  out += ",\"beta_start\":" + Num(p.beta_start) + ",\"beta_end\":" + Num(p.beta_end);
  out += ",\"cosine_offset\":" + Num(p.cosine_offset) + ",\"max_beta\":" + Num(p.max_beta);
  out += ",\"sigmoid_start\":" + Num(p.sigmoid_start) + ",\"sigmoid_end\":" + Num(p.sigmoid_end);
  out += ",\"sigmoid_tau\":" + Num(p.sigmoid_tau);
  out += ",\"log_snr_max\":" + Num(p.log_snr_max) + ",\"log_snr_min\":" + Num(p.log_snr_min);
  out += ",\"log_snr_shift\":" + Num(p.log_snr_shift);
  out += std::string(",\"zero_terminal_snr\":") + (p.zero_terminal_snr ? "true" : "false");
  out += ",\"respaced_steps\":" + std::to_string(p.respaced_steps) + "},\"columns\":{";
  const std::vector<std::pair<const char*, std::function<double(const VarianceStep&)>>> columns = {
      {"t", [](const VarianceStep& s) { return static_cast<double>(s.t); }},
      {"source_t", [](const VarianceStep& s) { return static_cast<double>(s.source_t); }},
      {"beta", [](const VarianceStep& s) { return s.beta; }},
      {"alpha", [](const VarianceStep& s) { return s.alpha; }},
      {"alpha_bar", [](const VarianceStep& s) { return s.alpha_bar; }},
      {"sqrt_alpha_bar", [](const VarianceStep& s) { return s.sqrt_alpha_bar; }},
      {"sqrt_one_minus_alpha_bar",
       [](const VarianceStep& s) { return s.sqrt_one_minus_alpha_bar; }},
      {"snr", [](const VarianceStep& s) { return s.snr; }},
      {"log_snr", [](const VarianceStep& s) { return s.log_snr; }},
      {"posterior_variance", [](const VarianceStep& s) { return s.posterior_variance; }},
      {"posterior_log_variance_clipped",
       [](const VarianceStep& s) { return s.posterior_log_variance_clipped; }},
      {"posterior_mean_coef_x0", [](const VarianceStep& s) { return s.posterior_mean_coef_x0; }},
      {"posterior_mean_coef_xt", [](const VarianceStep& s) { return s.posterior_mean_coef_xt; }},
  };
  for (size_t c = 0; c < columns.size(); ++c) {
    if (c) out += ",";
    out += "\"" + std::string(columns[c].first) + "\":" + Array(rows, columns[c].second);
  }
  return out + "}}";
}

VarianceParams With(VarianceKind kind, const std::function<void(VarianceParams&)>& edit = {}) {
  VarianceParams p;
  p.kind = kind;
  if (edit) edit(p);
  return p;
}

// Density and score on the midpoint grid (i + 1/2)/n, so the script can integrate nucleate's own
// values and compare them point by point with its image sum.
std::string WrappedNormalJson(double sigma, int n) {
  namespace s = nucleate::schedule;
  const int images = s::WrappedNormalImagesFor(sigma);
  const s::TruncationBound bound = s::WrappedNormalTruncationBound(sigma, images);
  std::vector<double> density(n), score(n);
  for (int i = 0; i < n; ++i) {
    const double x = (i + 0.5) / n;
    density[i] = s::WrappedNormalDensity(x, sigma, images);
    score[i] = s::WrappedNormalScore(x, sigma, images);
  }
  auto id = [](double v) { return v; };
  return "{\"sigma\":" + Num(sigma) + ",\"images\":" + std::to_string(images) +
         ",\"density_relative_error_bound\":" + Num(bound.density_relative_error) +
         ",\"score_absolute_error_bound\":" + Num(bound.score_absolute_error) +
         ",\"tv_distance_to_uniform\":" + Num(s::WrappedNormalTvDistanceToUniform(sigma)) +
         ",\"grid_points\":" + std::to_string(n) + ",\"density\":" + Array(density, id) +
         ",\"score\":" + Array(score, id) + "}";
}

void Run() {
  std::vector<std::pair<std::string, VarianceParams>> tables = {
      {"linear", With(VarianceKind::kLinear)},
      {"cosine", With(VarianceKind::kCosine)},
      {"sigmoid", With(VarianceKind::kSigmoid)},
      {"log_snr_linear", With(VarianceKind::kLogSnrLinear)},
      {"linear_respaced_50", With(VarianceKind::kLinear, [](auto& p) { p.respaced_steps = 50; })},
      {"cosine_respaced_37", With(VarianceKind::kCosine, [](auto& p) { p.respaced_steps = 37; })},
      {"cosine_shift_minus_2", With(VarianceKind::kCosine, [](auto& p) { p.log_snr_shift = -2; })},
      {"linear_shift_plus_1", With(VarianceKind::kLinear, [](auto& p) { p.log_snr_shift = 1; })},
      {"linear_zero_terminal",
       With(VarianceKind::kLinear, [](auto& p) { p.zero_terminal_snr = true; })},
      {"cosine_zero_terminal_respaced_100", With(VarianceKind::kCosine,
                                                 [](auto& p) {
                                                   p.zero_terminal_snr = true;
                                                   p.respaced_steps = 100;
                                                 })},
      {"linear_one_step", With(VarianceKind::kLinear, [](auto& p) { p.steps = 1; })},
  };
  std::printf("{\"format\":\"nucleate-schedule-dump-1\",\"tables\":[");
  for (size_t i = 0; i < tables.size(); ++i) {
    std::printf("%s%s\n", i ? "," : "", TableJson(tables[i].first, tables[i].second).c_str());
  }
  std::printf("],\"wrapped_normal\":[");
  const std::vector<double> sigmas = {0.005, 0.01, 0.05, 0.1, 0.3, 0.5, 1.0};
  for (size_t i = 0; i < sigmas.size(); ++i) {
    std::printf("%s%s\n", i ? "," : "", WrappedNormalJson(sigmas[i], 2048).c_str());
  }
  std::printf("],\"tv\":[");
  const std::vector<double> tv_sigmas = {1e-4, 3e-4, 1e-3, 0.005, 0.02, 0.05, 0.1, 0.15,
                                         0.19, 0.2,  0.21, 0.3,   0.5,  0.8,  1.0, 2.0};
  for (size_t i = 0; i < tv_sigmas.size(); ++i) {
    std::printf("%s{\"sigma\":%s,\"tv\":%s}", i ? "," : "", Num(tv_sigmas[i]).c_str(),
                Num(nucleate::schedule::WrappedNormalTvDistanceToUniform(tv_sigmas[i])).c_str());
  }
  std::printf("]}\n");
}

}  // namespace

int main() {
  try {
    Run();
  } catch (const nucleate::Error& e) {
    std::fprintf(stderr, "dump_schedule_tables: %s\n", e.what());
    return 1;
  }
  return 0;
}
