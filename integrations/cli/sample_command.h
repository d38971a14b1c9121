// nucleate sample: candidate structures from a trained model through the C ABI method Sample.
// Settings come from flags and/or a YAML job file (SAMPLE_JOB.md); the candidates are written to
// an out folder (CIF, extended XYZ, summary.jsonl) and shown as a table, with the caution that
// they are hypotheses. A progress bar on a terminal; Ctrl-C / SIGTERM keeps what was finished.
#pragma once

#include <CLI/CLI.hpp>
#include <functional>

namespace nucleate::cli {

void AddSampleCommand(CLI::App& app, std::function<int()>* run);

}  // namespace nucleate::cli
