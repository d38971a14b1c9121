// Check: every structure of a request read and checked (geometry, symmetry, chemistry).
#pragma once

#include "dispatch.h"

namespace nucleate::capi {

MethodEntry CheckMethod();

}  // namespace nucleate::capi
