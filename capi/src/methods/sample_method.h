// Sample: candidate structures from a model, checked and grouped. The only code that converts
// sample messages to core/sample types and back.
#pragma once

#include "core/sample/sample_job.h"
#include "core/sample/sampler_settings.h"
#include "dispatch.h"
#include "nucleate/v1/sample.pb.h"

namespace nucleate::capi {

// The sampler and the sampling limits of a request, shared with Assess. Defaults are core's for
// what is left out; InvalidArgument naming "sampler.<field>" / "limits.<field>".
sample::SamplerSettings SamplerFromMessage(const v1::SamplerSettings& message);
sample::SampleLimits LimitsFromMessage(const v1::SampleLimits& message);
// The caution of every reply that shows candidates (Sample, Assess).
const char* CandidateCaution();

MethodEntry SampleMethod();

}  // namespace nucleate::capi
