// Schedule parameters <-> their nucleate.v1 messages (schemas/nucleate/v1/schedule.proto): the one
// conversion, used by the bundle file and by the C ABI's schedule methods. Fields left out of a message take core's defaults, as in requests.
#pragma once

#include <string>

#include "core/schedule/discrete_transitions.h"
#include "core/schedule/sigma_schedule.h"
#include "core/schedule/variance_schedule.h"
#include "nucleate/v1/schedule.pb.h"

namespace nucleate::model {

// FromMessage throws InvalidArgument naming the field ("kind") for an enum value this library does
// not know; it does not validate ranges (schedule::Validate*Params does).
schedule::VarianceParams FromMessage(const v1::VarianceSchedule& message);
schedule::VarianceKind VarianceKindFromMessage(v1::VarianceKind kind, const std::string& field);
schedule::SigmaKind SigmaKindFromMessage(v1::SigmaKind kind, const std::string& field);
schedule::SigmaParams FromMessage(const v1::SigmaSchedule& message);
schedule::TransitionParams FromMessage(const v1::TransitionSchedule& message);

void ToMessage(const schedule::VarianceParams& params, v1::VarianceSchedule* message);
void ToMessage(const schedule::SigmaParams& params, v1::SigmaSchedule* message);
void ToMessage(const schedule::TransitionParams& params, v1::TransitionSchedule* message);

}  // namespace nucleate::model
