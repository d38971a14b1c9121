// A long method (Train, Sample) run from the command line: progress on stderr and in the log
// file, library log lines in both, and SIGINT / SIGTERM (Ctrl-C, or a batch scheduler's warning
// before the time limit) turned into a cancellation at the next progress report, so the method
// returns what it finished.
#pragma once

#include <ostream>
#include <string>

#include "nucleate/nucleate.h"

namespace nucleate::cli {

// The reply JSON; *cancelled tells whether the call was cancelled. `log` may be null. Errors as
// CallJsonObserved raises them, after the progress line is ended. `quiet`: nothing on stderr
// (for MPI ranks whose rank 0 already shows the progress). `collective` as CallJsonObserved.
std::string CallWithProgress(const std::string& method, const std::string& request_json,
                             std::ostream* log, bool* cancelled, bool quiet = false,
                             const nucleate_collective_v1* collective = nullptr);

}  // namespace nucleate::cli
