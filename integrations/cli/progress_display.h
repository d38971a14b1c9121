// Progress of a long call: a bar with the time left, redrawn in place when stderr is a terminal;
// otherwise a plain line per 5 % on stderr, so a batch job's output stays readable; or nothing on
// stderr (MPI ranks other than 0). With a log file, the plain lines (and every log line) also go
// there, whatever stderr gets.
#pragma once

#include <chrono>
#include <ostream>
#include <string>

namespace nucleate::cli {

enum class StderrProgress { kBar, kLines, kNone };

class ProgressDisplay {
 public:
  // `log` may be null.
  ProgressDisplay(StderrProgress stderr_mode, std::ostream* log);

  void Update(double fraction);

  // A line of text (the library's log, a note): never in the middle of the bar.
  void Line(const std::string& line);

  // Ends the bar's line; call before printing anything else on stderr.
  void Finish();

 private:
  using Clock = std::chrono::steady_clock;
  std::string PlainLine(double fraction, double elapsed, double left) const;

  StderrProgress stderr_mode_;
  std::ostream* log_;
  Clock::time_point start_;
  bool drawn_ = false;
  double next_line_ = 0;
  bool last_line_written_ = false;
  int drawn_percent_ = -1;
  Clock::time_point drawn_at_;
};

}  // namespace nucleate::cli
