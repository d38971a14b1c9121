#include "svg_plot.h"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <fstream>
#include <limits>
#include <sstream>
#include <stdexcept>

namespace nucleate::cli {
namespace {

constexpr double kWidth = 720, kHeight = 440;
constexpr double kLeft = 80, kRight = 24, kTop = 40, kBottom = 56;
// Our own palette: deep teal, burnt orange, slate violet.
const char* const kColours[] = {"#1b6f6a", "#c8602a", "#5a4e8c"};

std::string Escape(const std::string& text) {
  std::string out;
  for (char c : text) {
    if (c == '<') out += "&lt;";
    else if (c == '>') out += "&gt;";
    else if (c == '&') out += "&amp;";
    else out += c;
  }
  return out;
}

std::string Tick(double value) {
  char buffer[32];
  std::snprintf(buffer, sizeof buffer, "%.3g", value);
  return buffer;
}

}  // namespace

void WriteSvgPlot(const std::string& path, const PlotSpec& spec,
                  const std::vector<PlotSeries>& series) {
  auto transform_y = [&](double y) { return spec.log_y ? std::log10(y) : y; };
  double x_lo = std::numeric_limits<double>::infinity(), x_hi = -x_lo, y_lo = x_lo, y_hi = -x_lo;
  for (const PlotSeries& s : series) {
    for (size_t i = 0; i < s.x.size(); ++i) {
      const double y = transform_y(s.y[i]);
      if (!std::isfinite(s.x[i]) || !std::isfinite(y)) continue;
      x_lo = std::min(x_lo, s.x[i]);
      x_hi = std::max(x_hi, s.x[i]);
      y_lo = std::min(y_lo, y);
      y_hi = std::max(y_hi, y);
    }
  }
  if (!std::isfinite(x_lo)) x_lo = 0, x_hi = 1, y_lo = 0, y_hi = 1;
  if (x_hi == x_lo) x_hi = x_lo + 1;
  if (y_hi == y_lo) y_hi = y_lo + 1;
  const double plot_w = kWidth - kLeft - kRight, plot_h = kHeight - kTop - kBottom;
  auto px = [&](double x) { return kLeft + (x - x_lo) / (x_hi - x_lo) * plot_w; };
  auto py = [&](double y) { return kTop + (1 - (y - y_lo) / (y_hi - y_lo)) * plot_h; };

  std::ostringstream svg;
  svg << "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"" << kWidth << "\" height=\""
      << kHeight << "\" font-family=\"sans-serif\" font-size=\"12\">\n"
      << "<rect width=\"100%\" height=\"100%\" fill=\"#fbfaf6\"/>\n"
      << "<text x=\"" << kWidth / 2 << "\" y=\"24\" text-anchor=\"middle\" font-size=\"15\">"
      << Escape(spec.title) << "</text>\n"
      << "<rect x=\"" << kLeft << "\" y=\"" << kTop << "\" width=\"" << plot_w << "\" height=\""
      << plot_h << "\" fill=\"none\" stroke=\"#444\"/>\n";
  for (int i = 0; i <= 4; ++i) {
    const double xv = x_lo + (x_hi - x_lo) * i / 4, yv = y_lo + (y_hi - y_lo) * i / 4;
    svg << "<text x=\"" << px(xv) << "\" y=\"" << kTop + plot_h + 18
        << "\" text-anchor=\"middle\">" << Tick(xv) << "</text>\n"
        << "<text x=\"" << kLeft - 6 << "\" y=\"" << py(yv) + 4 << "\" text-anchor=\"end\">"
        << Tick(spec.log_y ? std::pow(10.0, yv) : yv) << "</text>\n"
        << "<line x1=\"" << kLeft << "\" x2=\"" << kLeft + plot_w << "\" y1=\"" << py(yv)
        << "\" y2=\"" << py(yv) << "\" stroke=\"#ddd\"/>\n";
  }
  svg << "<text x=\"" << kLeft + plot_w / 2 << "\" y=\"" << kHeight - 12
      << "\" text-anchor=\"middle\">" << Escape(spec.x_label) << "</text>\n"
      << "<text transform=\"translate(18," << kTop + plot_h / 2
      << ") rotate(-90)\" text-anchor=\"middle\">" << Escape(spec.y_label) << "</text>\n";
  for (size_t k = 0; k < series.size(); ++k) {
    const char* colour = kColours[k % 3];
    svg << "<polyline fill=\"none\" stroke=\"" << colour << "\" stroke-width=\"1.8\" points=\"";
    for (size_t i = 0; i < series[k].x.size(); ++i) {
      const double y = transform_y(series[k].y[i]);
      if (!std::isfinite(series[k].x[i]) || !std::isfinite(y)) continue;
      svg << px(series[k].x[i]) << ',' << py(y) << ' ';
    }
    // Legend in the top margin, clear of any curve.
    svg << "\"/>\n<text x=\"" << kLeft + plot_w - 90 * k << "\" y=\"" << kTop - 8
        << "\" text-anchor=\"end\" fill=\"" << colour << "\">" << Escape(series[k].name)
        << "</text>\n";
  }
  svg << "</svg>\n";

  std::ofstream file(path);
  file << svg.str();
  if (!file) throw std::runtime_error("cannot write the plot to '" + path + "'");
}

}  // namespace nucleate::cli
