// ModelBundle <-> nucleate.v1.ModelBundle: the one place where the bundle's core struct and its
// message meet (schedule parameters go through schedule_messages.h).
#pragma once

#include "core/model/bundle/bundle_limits.h"
#include "core/model/bundle/model_bundle.h"
#include "nucleate/v1/model.pb.h"

namespace nucleate::model {

// Writes every field; the species schedule only in SpeciesMode::kAbsorbing.
void ToMessage(const ModelBundle& bundle, v1::ModelBundle* message);

// Checks sizes against `limits` and, when given, the tensors against expected_layout(architecture)
// before allocating for them, converts, then runs ValidateModelBundle. Errors name the field
// inside the bundle ("tensors[3]", "architecture.hidden", ...). The format version is the
// caller's to check.
ModelBundle FromMessage(const v1::ModelBundle& message, const BundleLimits& limits,
                        const LayoutForArchitecture& expected_layout);

}  // namespace nucleate::model
