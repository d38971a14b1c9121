// The readable result of `nucleate sample` on stdout: the caution, one row per candidate (failed
// samples with their error), problems under invalid rows, and the counts.
#pragma once

#include <cstdio>

#include "sample_reply.h"

namespace nucleate::cli {

void PrintSampleTable(const SampleResult& result, std::FILE* out);

// "10 requested: 10 finished, 0 failed, 7 valid, 6 unique (5 valid and unique)".
std::string SampleCountsLine(const SampleResult& result);

}  // namespace nucleate::cli
