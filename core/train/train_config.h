// Reading a training configuration from YAML (yaml-cpp). Every key is documented in CONFIG.md
// beside this file; an unknown key, a wrong type or a value out of range is an error naming the
// key path and line ("training.batch_size (line 12): must be >= 1"), so a typo never trains a model
// with a silently ignored setting.
#pragma once

#include <string>

#include "core/train/train_settings.h"

namespace nucleate::train {

// `base_directory` resolves relative paths in the file (data and output paths); `source_name`
// labels errors (the file name). Throws InvalidArgument with field "<source>:<line>: <key path>".
TrainSettings ReadTrainConfig(const std::string& yaml_text, const std::string& base_directory,
                              const std::string& source_name);

}  // namespace nucleate::train
