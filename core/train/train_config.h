// Reading a training configuration from YAML (yaml-cpp). Every key is documented in CONFIG.md
// beside this file; an unknown or repeated key, a wrong type or a value out of range is an error
// naming the file, line and key path ("train.yaml:12: training.batch_size: must be >= 1"), so a
// typo never trains a model with a silently ignored setting. Everything that does not need the
// data is checked here, before any work.
#pragma once

#include <string>

#include "core/common/error.h"
#include "core/train/train_settings.h"

namespace nucleate::train {

// `base_directory` resolves relative paths in the file (data and output paths); `source_name`
// labels errors (the file name). Throws with field "<source>:<line>: <key path>" (InvalidArgument,
// or LimitExceeded for a size above its limit: diffusion.steps, training.threads), or
// "<source>:<line>" for a file that is not YAML or not a mapping.
TrainSettings ReadTrainConfig(const std::string& yaml_text, const std::string& base_directory,
                              const std::string& source_name);

// An error of reading the data (LoadDataset names DataSource fields: "directory",
// "property_names[1]") restated against the configuration key that set the field, with its file
// and line ("train.yaml:2: data.directory"); any other error, or settings not read from a file,
// unchanged.
Error AtConfigKey(const Error& error, const TrainSettings& settings);

}  // namespace nucleate::train
