// The checks every bundle passes before it is written and after it is read, so a file nucleate
// writes is always one it can load.
#pragma once

#include "core/model/bundle/bundle_limits.h"
#include "core/model/bundle/model_bundle.h"

namespace nucleate::model {

// InvalidArgument (or LimitExceeded for a size over `limits`) naming the field inside the bundle
// ("architecture.hidden", "schedules.lattice.beta_end", "tensors[3]", ...): invalid architecture
// or schedules, schedules that disagree on the step count or species classes, normalisation
// statistics of the wrong count or not finite or a std <= 0, histograms too long, values not
// matching the layout or not finite, a malformed dataset hash.
void ValidateModelBundle(const ModelBundle& bundle, const BundleLimits& limits);

}  // namespace nucleate::model
