// nucleate check: read structure files and check every structure before it costs DFT time.
#pragma once

#include <CLI/CLI.hpp>

namespace nucleate::cli {

void AddCheckCommand(CLI::App& app, std::function<int()>* run);

}  // namespace nucleate::cli
