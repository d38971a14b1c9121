// Match and Dedup: the only code that converts match messages to core/match types and back.
#pragma once

#include "core/match/tolerances.h"
#include "dispatch.h"
#include "nucleate/v1/match.pb.h"

namespace nucleate::capi {

// Defaults for what is left out; InvalidArgument naming "tolerances.<field>".
match::MatchTolerances TolerancesFromMessage(const v1::MatchTolerances& message);

MethodEntry MatchMethod();
MethodEntry DedupMethod();

}  // namespace nucleate::capi
