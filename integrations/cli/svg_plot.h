// A small self-contained SVG line plot, enough to look at a schedule without other tools.
#pragma once

#include <string>
#include <vector>

namespace nucleate::cli {

struct PlotSeries {
  std::string name;
  std::vector<double> x;
  std::vector<double> y;  // non-finite points are left out (log-SNR is -inf at zero terminal SNR)
};

struct PlotSpec {
  std::string title;
  std::string x_label;
  std::string y_label;
  bool log_y = false;
};

// Throws std::runtime_error naming the path if it cannot be written.
void WriteSvgPlot(const std::string& path, const PlotSpec& spec,
                  const std::vector<PlotSeries>& series);

}  // namespace nucleate::cli
