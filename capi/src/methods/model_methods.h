// Train (a whole training run from a YAML configuration) and ModelInfo (what a model file holds).
#pragma once

#include "dispatch.h"

namespace nucleate::capi {

MethodEntry TrainMethod();
MethodEntry ModelInfoMethod();

}  // namespace nucleate::capi
