// nucleate sample: candidate structures from a trained model through the C ABI method Sample.
// Settings come from flags and/or a YAML job file (SAMPLE_JOB.md); the candidates are written to
// an out folder (CIF, extended XYZ, summary.jsonl) and shown as a table, with the caution that
// they are hypotheses. A progress bar on a terminal; Ctrl-C / SIGTERM keeps what was finished.
#pragma once

#include <CLI/CLI.hpp>
#include <functional>
#include <ostream>
#include <string>

#include "sample_request.h"
#include "sample_settings.h"

namespace nucleate::cli {

// How a run's Sample call is made: by default once, in this process (CallSampleHere);
// integrations/mpi spreads the request over MPI ranks and merges their parts.
struct SampleCaller {
  // The reply JSON of the whole request `plan` (planned from `settings`); *cancelled as
  // CallWithProgress sets it. Raises CallFailed as the library refuses.
  std::function<std::string(const SampleSettings& settings, const SamplePlan& plan,
                            std::ostream* log, bool* cancelled)>
      call;
  // False on processes that only contribute a part (MPI ranks other than 0): they write no
  // files, no log and no table.
  bool writes_outputs = true;
};

std::string CallSampleHere(const SampleSettings& settings, const SamplePlan& plan,
                           std::ostream* log, bool* cancelled);

void AddSampleCommand(CLI::App& app, std::function<int()>* run,
                      SampleCaller caller = {CallSampleHere, true});

}  // namespace nucleate::cli
