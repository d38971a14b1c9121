// The readable result of `nucleate sample` on stdout: the caution, one row per candidate (failed
// samples with their error), problems under invalid rows, and the counts.
#pragma once

#include <cstdio>
#include <string>

#include "sample_reply.h"

namespace nucleate::cli {

void PrintSampleTable(const SampleResult& result, std::FILE* out);

// "toxic:Tl radioactive:U", or "-": flags for handling, not failures.
std::string HandlingFlags(const YAML::Node& report);
// "Fm-3m (225)", or "none" when no space group was found.
std::string SpaceGroupText(const YAML::Node& report);

// "10 requested: 10 finished, 0 failed, 7 valid, 6 unique (5 valid and unique)".
std::string SampleCountsLine(const SampleResult& result);

}  // namespace nucleate::cli
