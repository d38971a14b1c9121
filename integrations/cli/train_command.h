// nucleate train --config FILE: a training run from its YAML file, with a progress bar on a
// terminal (plain lines otherwise), the library's log lines, and Ctrl-C / SIGTERM turned into a
// clean cancellation that still writes the model. nucleate model info FILE: what a model holds.
#pragma once

#include <functional>

#include <CLI/CLI.hpp>

namespace nucleate::cli {

void AddTrainCommand(CLI::App& app, std::function<int()>* run);
void AddModelCommand(CLI::App& app, std::function<int()>* run);

}  // namespace nucleate::cli
