// A YAML job file for `nucleate sample --job FILE`: flat keys named like the flags (snake_case),
// documented in SAMPLE_JOB.md.
#pragma once

#include <string>

#include "sample_settings.h"

namespace nucleate::cli {

// Reads `path`. Relative paths in it (model, out, vary, constrain, log) are made relative to the
// file's folder. Throws CLI::ValidationError naming the file, line and key for an unknown key or a
// value of the wrong shape, std::runtime_error when the file cannot be read.
SampleSettings ReadSampleJobFile(const std::string& path);

}  // namespace nucleate::cli
