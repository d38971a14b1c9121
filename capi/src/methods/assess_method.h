// Assess: how good a trained model is, measured on held-out structures. The only code that
// converts assess messages to core/assess types and back.
#pragma once

#include "dispatch.h"

namespace nucleate::capi {

MethodEntry AssessMethod();

}  // namespace nucleate::capi
