// nucleate train --config FILE: a training run from its YAML file, with a progress bar on a
// terminal (plain lines otherwise), the library's log lines, and Ctrl-C / SIGTERM turned into a
// clean cancellation that still writes the model. nucleate model info FILE: what a model holds.
#pragma once

#include <functional>

#include <CLI/CLI.hpp>

#include "nucleate/nucleate.h"

namespace nucleate::cli {

// The processes a training run shares (integrations/mpi); the default is this process alone.
struct TrainProcesses {
  const nucleate_collective_v1* collective = nullptr;  // must outlive the run
  bool writes_outputs = true;  // false on MPI ranks other than 0: no log file, table or progress
};

void AddTrainCommand(CLI::App& app, std::function<int()>* run, TrainProcesses processes = {});
void AddModelCommand(CLI::App& app, std::function<int()>* run);

}  // namespace nucleate::cli
