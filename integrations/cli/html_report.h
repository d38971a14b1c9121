// report.html of `nucleate sample`: one self-contained page (inline CSS and SVG, no scripts, no
// links) with the caution, the counts, and a row per candidate with its flags and a drawing of
// its cell, for a quick look before anything is sent to DFT.
#pragma once

#include <string>

#include "sample_reply.h"

namespace nucleate::cli {

// `xyz` is the extended XYZ of the finished candidates, one frame each in row order (as written
// to candidates.xyz): the drawings take the cell and Cartesian positions from it.
std::string SampleReportHtml(const SampleResult& result, const std::string& xyz,
                             const std::string& title);

}  // namespace nucleate::cli
