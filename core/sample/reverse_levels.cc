#include "core/sample/reverse_levels.h"

#include <algorithm>
#include <string>

#include "core/common/error.h"

namespace nucleate::sample {

std::vector<ReverseLevel> BuildReverseLevels(const model::DiffusionProcess& process,
                                             long long steps) {
  const long long T = process.steps();
  if (steps < 0 || steps > T) {
    throw InvalidArgument("sampler.steps", "must lie in 0.." + std::to_string(T));
  }
  // The lattice table of the chain as core/schedule builds it, respaced when asked: one place
  // computes betas and posteriors from alpha_bar.
  schedule::VarianceParams lattice = process.schedules().lattice;
  lattice.respaced_steps = steps == T ? 0 : steps;
  schedule::ScheduleLimits limits;
  limits.max_steps = std::max<std::int64_t>(limits.max_steps, T);
  const std::vector<schedule::VarianceStep> table = schedule::BuildVarianceSchedule(lattice, limits);

  std::vector<ReverseLevel> levels(table.size());
  const std::size_t n = table.size();
  for (std::size_t k = 0; k < n; ++k) {
    const schedule::VarianceStep& row = table[n - 1 - k];  // noisiest first
    ReverseLevel& level = levels[k];
    level.t = row.source_t;
    level.lattice = row;
    level.sigma = process.sigma(level.t);
    level.score_scale = process.score_scale(level.t);
    level.kept = process.species_kept(level.t);
    if (k + 1 < n) {
      const long long next = table[n - 2 - k].source_t;
      level.alpha_bar_next = table[n - 2 - k].alpha_bar;
      level.sigma_next = process.sigma(next);
      level.kept_next = process.species_kept(next);
    }
  }
  return levels;
}

std::size_t FirstLevelAtOrBelow(const std::vector<ReverseLevel>& levels, long long t) {
  std::size_t k = 0;
  while (k + 1 < levels.size() && levels[k].t > t) ++k;
  return k;
}

}  // namespace nucleate::sample
