// nucleate convert: structure files rewritten as CIF, symmetrised CIF, extended XYZ or JSON.
#pragma once

#include <CLI/CLI.hpp>

namespace nucleate::cli {

void AddConvertCommand(CLI::App& app, std::function<int()>* run);

}  // namespace nucleate::cli
