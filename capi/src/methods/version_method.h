#pragma once

#include "dispatch.h"

namespace nucleate::capi {

MethodEntry VersionMethod();

}  // namespace nucleate::capi
