#include "interruptible_call.h"

#include <unistd.h>

#include <atomic>
#include <csignal>

#include "abi_client.h"
#include "progress_display.h"

namespace nucleate::cli {
namespace {

std::atomic<bool> g_stop{false};
extern "C" void RequestStop(int) { g_stop = true; }

}  // namespace

std::string CallWithProgress(const std::string& method, const std::string& request_json,
                             std::ostream* log, bool* cancelled, bool quiet,
                             const nucleate_collective_v1* collective) {
  const StderrProgress mode = quiet                            ? StderrProgress::kNone
                              : ::isatty(STDERR_FILENO) == 1 ? StderrProgress::kBar
                                                             : StderrProgress::kLines;
  ProgressDisplay display(mode, log);
  CallObserver observer;
  observer.log = [&](int, const std::string& line) { display.Line(line); };
  observer.progress = [&](double fraction, const std::string&) {
    display.Update(fraction);
    return !g_stop;
  };
  g_stop = false;
  std::signal(SIGINT, RequestStop);
  std::signal(SIGTERM, RequestStop);
  try {
    std::string reply = CallJsonObserved(method, request_json, observer, cancelled, collective);
    display.Finish();
    return reply;
  } catch (...) {
    display.Finish();
    throw;
  }
}

}  // namespace nucleate::cli
