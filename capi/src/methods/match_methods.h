// Match and Dedup: the only code that converts match messages to core/match types and back.
#pragma once

#include "dispatch.h"

namespace nucleate::capi {

MethodEntry MatchMethod();
MethodEntry DedupMethod();

}  // namespace nucleate::capi
