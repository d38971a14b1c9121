// nucleate design: schedule parameters chosen from targets, with what they achieve.
#pragma once

#include <CLI/CLI.hpp>

namespace nucleate::cli {

void AddDesignCommand(CLI::App& app, std::function<int()>* run);

}  // namespace nucleate::cli
