// nucleate assess: how good a trained model is, through the C ABI method Assess. The held-out
// structures are the test split rebuilt from the model's training configuration (--config), or
// structure files (--held-out, with --training for novelty). Prints a table of each figure with
// its sample size, or the reply as protobuf JSON; a progress bar on a terminal; Ctrl-C / SIGTERM
// stops and prints the figures of what finished.
#pragma once

#include <CLI/CLI.hpp>
#include <functional>

namespace nucleate::cli {

void AddAssessCommand(CLI::App& app, std::function<int()>* run);

}  // namespace nucleate::cli
