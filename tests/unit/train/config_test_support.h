// What the training-configuration tests share: the smallest valid file and the error a file gets.
#pragma once

#include <string>

#include "core/common/error.h"
#include "core/train/train_config.h"

namespace nucleate::train::testing {

// Data on line 2, output on line 4: sections a test appends start on line 5.
inline const char* const kMinimal = R"(data:
  directory: structures
output:
  model: out/model.nucleate
)";

// The error ReadTrainConfig throws for `yaml` (directory /runs/a, name train.yaml); a default
// (kInternal, no field, "no error") when it throws none, which every expectation then fails on.
inline Error ErrorOf(const std::string& yaml) {
  try {
    ReadTrainConfig(yaml, "/runs/a", "train.yaml");
  } catch (const Error& e) {
    return e;
  }
  return Error(ErrorKind::kInternal, "", "no error");
}

// Its message, for tests that look for words in it.
inline std::string MessageOf(const std::string& yaml) { return ErrorOf(yaml).what(); }

}  // namespace nucleate::train::testing
