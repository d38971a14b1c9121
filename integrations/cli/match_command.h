// nucleate match A B: whether two structure files hold the same crystal.
// nucleate dedup FILE...: groups of equivalent structures, and novelty against references.
#pragma once

#include <CLI/CLI.hpp>

namespace nucleate::cli {

void AddMatchCommand(CLI::App& app, std::function<int()>* run);
void AddDedupCommand(CLI::App& app, std::function<int()>* run);

}  // namespace nucleate::cli
