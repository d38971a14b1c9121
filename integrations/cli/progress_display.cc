#include "progress_display.h"

#include <cstdio>
#include <iostream>

namespace nucleate::cli {
namespace {

std::string Duration(double seconds) {
  const long s = static_cast<long>(seconds + 0.5);
  char text[32];
  if (s >= 3600) {
    std::snprintf(text, sizeof text, "%ldh%02ldm", s / 3600, (s % 3600) / 60);
  } else {
    std::snprintf(text, sizeof text, "%ldm%02lds", s / 60, s % 60);
  }
  return text;
}

}  // namespace

ProgressDisplay::ProgressDisplay(StderrProgress stderr_mode, std::ostream* log)
    : stderr_mode_(stderr_mode), log_(log), start_(Clock::now()) {}

std::string ProgressDisplay::PlainLine(double fraction, double elapsed, double left) const {
  return "progress " + std::to_string(static_cast<int>(fraction * 100)) + "% elapsed " +
         Duration(elapsed) + " left " + Duration(left);
}

void ProgressDisplay::Update(double fraction) {
  const auto now = Clock::now();
  const double elapsed = std::chrono::duration<double>(now - start_).count();
  // The rate so far, extrapolated: samples of one request take about equally long.
  const double left = fraction > 0 ? elapsed * (1 - fraction) / fraction : 0;
  // Redrawn when the percentage moves or every half second (the time left), not on every report:
  // a large request reports thousands of times.
  const int percent = static_cast<int>(fraction * 100);
  if (stderr_mode_ == StderrProgress::kBar &&
      (percent != drawn_percent_ || now - drawn_at_ > std::chrono::milliseconds(500))) {
    drawn_percent_ = percent;
    drawn_at_ = now;
    const int width = 30, filled = static_cast<int>(fraction * width);
    std::cerr << "\r[" << std::string(filled, '#') << std::string(width - filled, '-') << "] "
              << percent << "%  elapsed " << Duration(elapsed) << "  left " << Duration(left)
              << "   " << std::flush;
    drawn_ = true;
  }
  // A line per 5 %, and always the last one (100 % may fall short of the next 5 % mark).
  const bool last = fraction >= 1 && !last_line_written_;
  if (fraction < next_line_ && !last) return;
  last_line_written_ = last_line_written_ || fraction >= 1;
  next_line_ = fraction + 0.05;
  const std::string line = PlainLine(fraction, elapsed, left);
  if (stderr_mode_ == StderrProgress::kLines) std::cerr << line << '\n';
  if (log_ != nullptr) *log_ << line << std::endl;
}

void ProgressDisplay::Line(const std::string& line) {
  Finish();
  if (stderr_mode_ != StderrProgress::kNone) std::cerr << line << '\n';
  if (log_ != nullptr) *log_ << line << std::endl;
}

void ProgressDisplay::Finish() {
  if (drawn_) std::cerr << '\n';
  drawn_ = false;
}

}  // namespace nucleate::cli
