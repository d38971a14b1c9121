#include "core/sample/sampler_settings.h"

#include <cmath>
#include <string>

#include "core/common/error.h"

namespace nucleate::sample {

void ValidateSamplerSettings(const SamplerSettings& s, long long model_steps) {
  if (s.steps < 0 || s.steps > model_steps) {
    throw InvalidArgument("sampler.steps", "must lie in 0.." + std::to_string(model_steps) +
                                               " (0 = every step of the model's schedule)");
  }
  if (!(s.eta >= 0 && s.eta <= 1)) throw InvalidArgument("sampler.eta", "must lie in [0, 1]");
  if (s.corrector_steps < 0 || s.corrector_steps > 100) {
    throw InvalidArgument("sampler.corrector_steps", "must lie in 0..100");
  }
  if (!(s.snr > 0 && s.snr <= 10)) throw InvalidArgument("sampler.snr", "must lie in (0, 10]");
  if (!(s.lattice_clip >= 0) || !std::isfinite(s.lattice_clip)) {
    throw InvalidArgument("sampler.lattice_clip", "must be finite and >= 0 (0 = no clipping)");
  }
}

}  // namespace nucleate::sample
