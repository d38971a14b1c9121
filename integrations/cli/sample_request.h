// From the merged settings of `nucleate sample` to a SampleRequest (protobuf JSON, field names of
// schemas/nucleate/v1/sample.proto) and the choices about output files. Values are checked here
// only as far as the JSON needs (a number is a number); the library checks the rest and names the
// request field, which FieldOrigin() turns back into the flag or job-file line that set it.
#pragma once

#include <cstdint>
#include <map>
#include <string>

#include "sample_settings.h"

namespace nucleate::cli {

struct SampleOutputOptions {
  std::string out_dir;
  std::string log_path;  // empty: no log file
  bool multi_cif = false;
  bool symmetrise = false;
  bool force = false;
  bool json = false;
};

struct SamplePlan {
  std::string request_json;
  SampleOutputOptions output;
  std::uint32_t first_index = 0;
  std::uint32_t count = 0;
  std::string description;                     // one line for the log
  std::map<std::string, std::string> origins;  // request field path -> where it was set

  // Where the request field named at the start of a library message (e.g. "sampler.eta: must
  // lie in [0, 1]" or "constrained.fixed_atoms[2]: ...") was set; empty when unknown.
  std::string FieldOrigin(const std::string& library_message) const;
};

// The CLI's default count when none is given (the library's is 1).
constexpr std::uint32_t kDefaultSampleCount = 10;

// Throws CLI::ValidationError naming the flag or job-file key for a value that cannot go into
// the request, a missing --model / --out / task, or a setting of another task.
SamplePlan PlanSample(const SampleSettings& settings);

}  // namespace nucleate::cli
