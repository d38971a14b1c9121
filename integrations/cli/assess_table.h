// The readable result of `nucleate assess`: the caution, the held-out set, one row per assessed
// composition, and every figure with its value and sample size.
#pragma once

#include <string>

namespace nucleate::cli {

// From the Assess reply (protobuf JSON).
std::string AssessTable(const std::string& reply_json);

}  // namespace nucleate::cli
