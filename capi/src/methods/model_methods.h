// Train (a whole training run from a YAML configuration), ModelInfo (what a model file holds) and
// Evaluate (one denoiser evaluation on given noisy cells).
#pragma once

#include "dispatch.h"

namespace nucleate::capi {

MethodEntry TrainMethod();
MethodEntry ModelInfoMethod();
MethodEntry EvaluateMethod();

}  // namespace nucleate::capi
