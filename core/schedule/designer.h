// Chooses schedule parameters from targets a user can reason about, and reports what it achieved.
#pragma once

#include "core/schedule/sigma_schedule.h"
#include "core/schedule/variance_schedule.h"

namespace nucleate::schedule {

struct DesignTargets {
  long long steps = 1000;
  // Log-SNR linear meets both SNR targets exactly with even steps in log-SNR, so it is the
  // default. Cosine and sigmoid end in a step clipped at max_beta that alone drops log-SNR by
  // about log(1 / (1 - max_beta)); their designs shift the whole curve, and max_log_snr_step in
  // the diagnostics shows that final jump.
  VarianceKind variance_kind = VarianceKind::kLogSnrLinear;
  double terminal_snr = 1e-4;        // SNR = alpha_bar / (1 - alpha_bar) at t = T
  double initial_snr = 1e4;          // at t = 1; used by kLinear (beta_start) and kLogSnrLinear
  SigmaKind sigma_kind = SigmaKind::kGeometric;
  double tv_distance = 0.005;        // distance to uniform wanted at sigma_max
  double resolution_angstrom = 0.02; // finest displacement wanted at sigma_min ...
  double cell_length_angstrom = 5.0; // ... for a cell axis this long
};

struct DesignDiagnostics {
  double achieved_terminal_snr = 0;
  double achieved_initial_snr = 0;
  double max_log_snr_step = 0;                 // largest |log_snr_t - log_snr_{t-1}|
  double tv_distance_at_sigma_max = 0;
  double finest_displacement_angstrom = 0;     // sigma_min * cell_length
  double coarsest_displacement_angstrom = 0;   // sigma_max * cell_length
};

struct Design {
  VarianceParams variance;
  SigmaParams sigma;
  DesignDiagnostics diagnostics;
};

// Linear: beta_start from initial_snr, beta_end solved (bisection) for terminal_snr.
// Log-SNR linear: endpoints set directly. Cosine and sigmoid: a log-SNR shift in closed form.
// Sigma: sigma_min = resolution / cell length; sigma_max the smallest sigma whose distance to
// uniform is at most tv_distance (bisection; the distance falls monotonically with sigma).
Design DesignSchedules(const DesignTargets& targets, const ScheduleLimits& limits);

}  // namespace nucleate::schedule
