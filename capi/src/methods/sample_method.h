// Sample: candidate structures from a model, checked and grouped. The only code that converts
// sample messages to core/sample types and back.
#pragma once

#include "dispatch.h"

namespace nucleate::capi {

MethodEntry SampleMethod();

}  // namespace nucleate::capi
