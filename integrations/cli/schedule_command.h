// nucleate schedule: one schedule table as CSV, JSON or a readable table, optionally plotted.
#pragma once

#include <CLI/CLI.hpp>

namespace nucleate::cli {

// Adds the subcommand; `run` is set to the function main calls when it was chosen.
void AddScheduleCommand(CLI::App& app, std::function<int()>* run);

}  // namespace nucleate::cli
