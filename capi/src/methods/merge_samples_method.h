// MergeSamples: the replies of one Sample request split by sample index (MPI ranks, job-array
// tasks) joined into the reply of the whole request.
#pragma once

#include "dispatch.h"

namespace nucleate::capi {

MethodEntry MergeSamplesMethod();

}  // namespace nucleate::capi
