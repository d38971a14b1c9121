// Schedule parameters <-> their nucleate.v1 messages (schemas/nucleate/v1/schedule.proto), for
// the bundle file. Fields left out of a message take core's defaults, as in requests.
#pragma once

#include "core/schedule/discrete_transitions.h"
#include "core/schedule/sigma_schedule.h"
#include "core/schedule/variance_schedule.h"
#include "nucleate/v1/schedule.pb.h"

namespace nucleate::model {

// FromMessage throws InvalidArgument naming the field ("kind") for an enum value this library does
// not know; it does not validate ranges (schedule::Validate*Params does).
schedule::VarianceParams FromMessage(const v1::VarianceSchedule& message);
schedule::SigmaParams FromMessage(const v1::SigmaSchedule& message);
schedule::TransitionParams FromMessage(const v1::TransitionSchedule& message);

void ToMessage(const schedule::VarianceParams& params, v1::VarianceSchedule* message);
void ToMessage(const schedule::SigmaParams& params, v1::SigmaSchedule* message);
void ToMessage(const schedule::TransitionParams& params, v1::TransitionSchedule* message);

}  // namespace nucleate::model
