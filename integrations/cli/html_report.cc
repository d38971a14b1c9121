#include "html_report.h"

#include <algorithm>
#include <array>
#include <cmath>
#include <cstdint>
#include <cstdio>
#include <sstream>
#include <stdexcept>
#include <vector>

#include "json_reply.h"
#include "sample_table.h"

namespace nucleate::cli {
namespace {

using Vec = std::array<double, 3>;

struct Frame {
  std::array<Vec, 3> cell{};  // rows a, b, c (angstrom)
  std::vector<std::string> symbols;
  std::vector<Vec> positions;  // Cartesian, angstrom
};

// The frames of an extended XYZ text as nucleate writes it: count, comment with Lattice="...",
// then "Symbol x y z" lines.
std::vector<Frame> ReadFrames(const std::string& xyz) {
  std::vector<Frame> frames;
  std::istringstream in(xyz);
  std::string line;
  while (std::getline(in, line)) {
    if (line.find_first_not_of(" \t\r") == std::string::npos) continue;
    const int atoms = std::stoi(line);
    std::string comment;
    std::getline(in, comment);
    Frame f;
    const auto start = comment.find("Lattice=\"");
    if (start == std::string::npos) throw std::runtime_error("extended XYZ frame without Lattice");
    std::istringstream numbers(comment.substr(start + 9));
    for (auto& row : f.cell) numbers >> row[0] >> row[1] >> row[2];
    for (int i = 0; i < atoms && std::getline(in, line); ++i) {
      std::istringstream atom(line);
      std::string symbol;
      Vec p{};
      atom >> symbol >> p[0] >> p[1] >> p[2];
      f.symbols.push_back(symbol);
      f.positions.push_back(p);
    }
    frames.push_back(std::move(f));
  }
  return frames;
}

std::string Escape(const std::string& text) {
  std::string out;
  for (char c : text) {
    switch (c) {
      case '&': out += "&amp;"; break;
      case '<': out += "&lt;"; break;
      case '>': out += "&gt;"; break;
      case '"': out += "&quot;"; break;
      default: out += c;
    }
  }
  return out;
}

// Our palette: the hue of a symbol is its FNV-1a hash spread around the colour wheel by the
// golden angle, at fixed saturation and lightness, so every element keeps one colour in every
// report and neighbours in the periodic table do not look alike by accident.
std::string Colour(const std::string& symbol) {
  std::uint32_t h = 2166136261u;
  for (unsigned char c : symbol) h = (h ^ c) * 16777619u;
  const double hue = std::fmod((h % 1000) * 137.508, 360.0);
  char text[40];
  std::snprintf(text, sizeof text, "hsl(%.0f,55%%,55%%)", hue);
  return text;
}

// A fixed oblique view: turned 28 degrees about the vertical, then tilted 18 degrees toward the
// viewer, so all three cell vectors show. Returns (x, y, depth).
Vec View(const Vec& p) {
  const double yaw = 28 * M_PI / 180, pitch = 18 * M_PI / 180;
  const double x1 = std::cos(yaw) * p[0] - std::sin(yaw) * p[1];
  const double y1 = std::sin(yaw) * p[0] + std::cos(yaw) * p[1];
  const double y2 = std::cos(pitch) * y1 - std::sin(pitch) * p[2];
  const double z2 = std::sin(pitch) * y1 + std::cos(pitch) * p[2];
  return {x1, z2, y2};  // screen x, screen up, depth (larger is farther)
}

std::string CellSvg(const Frame& f) {
  constexpr double kSize = 200, kMargin = 14;
  std::vector<Vec> corners;
  for (int i = 0; i < 8; ++i) {
    Vec p{};
    for (int k = 0; k < 3; ++k) {
      if (i & (1 << k)) {
        for (int d = 0; d < 3; ++d) p[d] += f.cell[k][d];
      }
    }
    corners.push_back(View(p));
  }
  double lo_x = 1e300, hi_x = -1e300, lo_y = 1e300, hi_y = -1e300;
  for (const Vec& c : corners) {
    lo_x = std::min(lo_x, c[0]);
    hi_x = std::max(hi_x, c[0]);
    lo_y = std::min(lo_y, c[1]);
    hi_y = std::max(hi_y, c[1]);
  }
  const double scale = (kSize - 2 * kMargin) / std::max({hi_x - lo_x, hi_y - lo_y, 1e-9});
  const auto sx = [&](const Vec& v) { return kMargin + (v[0] - lo_x) * scale; };
  const auto sy = [&](const Vec& v) { return kSize - kMargin - (v[1] - lo_y) * scale; };
  std::ostringstream svg;
  svg.precision(4);
  svg << "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"" << kSize << "\" height=\"" << kSize
      << "\" viewBox=\"0 0 " << kSize << " " << kSize << "\">";
  for (int i = 0; i < 8; ++i) {
    for (int k = 0; k < 3; ++k) {
      const int j = i | (1 << k);
      if (j == i) continue;
      svg << "<line x1=\"" << sx(corners[i]) << "\" y1=\"" << sy(corners[i]) << "\" x2=\""
          << sx(corners[j]) << "\" y2=\"" << sy(corners[j]) << "\" stroke=\"#7a7f8c\"/>";
    }
  }
  std::vector<std::size_t> order(f.positions.size());
  for (std::size_t i = 0; i < order.size(); ++i) order[i] = i;
  std::vector<Vec> viewed;
  for (const Vec& p : f.positions) viewed.push_back(View(p));
  std::sort(order.begin(), order.end(),
            [&](std::size_t a, std::size_t b) { return viewed[a][2] > viewed[b][2]; });
  const double radius = std::clamp(50.0 / std::sqrt(static_cast<double>(f.positions.size()) + 1), 3.0, 12.0);
  for (std::size_t i : order) {
    svg << "<circle cx=\"" << sx(viewed[i]) << "\" cy=\"" << sy(viewed[i]) << "\" r=\"" << radius
        << "\" fill=\"" << Colour(f.symbols[i]) << "\" stroke=\"#20242c\" stroke-width=\"0.8\"><title>"
        << Escape(f.symbols[i]) << "</title></circle>";
  }
  svg << "</svg>";
  return svg.str();
}

std::string Legend(const Frame& f) {
  std::vector<std::string> seen;
  for (const std::string& s : f.symbols) {
    if (std::find(seen.begin(), seen.end(), s) == seen.end()) seen.push_back(s);
  }
  std::string html;
  for (const std::string& s : seen) {
    html += "<span class=\"key\"><span class=\"dot\" style=\"background:" + Colour(s) + "\"></span>" +
            Escape(s) + "</span> ";
  }
  return html;
}

}  // namespace

std::string SampleReportHtml(const SampleResult& result, const std::string& xyz,
                             const std::string& title) {
  const std::vector<Frame> frames = ReadFrames(xyz);
  std::ostringstream html;
  html << "<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\"><title>"
       << Escape(title) << "</title>\n<style>"
       << "body{font-family:sans-serif;margin:1.5em;color:#1d2230;background:#fbfaf7}"
       << ".caution{border-left:5px solid #c8662e;padding:.6em 1em;background:#fff3e8}"
       << "table{border-collapse:collapse}td,th{border-bottom:1px solid #d9d6cf;padding:.35em .6em;"
       << "vertical-align:top;text-align:left}.bad{color:#a3261b}.flag{color:#8a4b00;font-weight:bold}"
       << ".key{margin-right:.8em;white-space:nowrap}.dot{display:inline-block;width:.8em;height:.8em;"
       << "border-radius:50%;margin-right:.3em;border:1px solid #20242c}</style></head><body>\n";
  html << "<h1>" << Escape(title) << "</h1>\n<p class=\"caution\">" << Escape(result.caution)
       << "</p>\n<p>" << Escape(SampleCountsLine(result)) << "</p>\n";
  html << "<table><tr><th>index</th><th>cell</th><th>formula</th><th>atoms</th><th>space group</th>"
          "<th>min distance</th><th>density</th><th>valid</th><th>duplicate of</th><th>flags</th>"
          "<th>problems</th></tr>\n";
  std::size_t frame = 0;
  for (const CandidateRow& row : result.rows) {
    html << "<tr><td>" << row.index << "</td>";
    if (!row.error.empty()) {
      html << "<td colspan=\"10\" class=\"bad\">failed: " << Escape(row.error) << "</td></tr>\n";
      continue;
    }
    const YAML::Node& r = row.report;
    html << "<td>";
    if (frame < frames.size()) {
      html << CellSvg(frames[frame]) << "<br>" << Legend(frames[frame]);
    }
    ++frame;
    char numbers[96];
    std::snprintf(numbers, sizeof numbers, "<td>%.3f &#8491;</td><td>%.3f g/cm&#179;</td>",
                  r["min_distance"] ? AsDouble(r["min_distance"]) : 0.0,
                  r["density"] ? AsDouble(r["density"]) : 0.0);
    const bool valid = r["valid"].as<bool>(false);
    const std::string flags = HandlingFlags(r);
    html << "</td><td>" << Escape(r["formula"].as<std::string>("")) << "</td><td>"
         << r["num_atoms"].as<int>(0) << "</td><td>" << Escape(SpaceGroupText(r)) << "</td>"
         << numbers << "<td" << (valid ? ">yes" : " class=\"bad\">no") << "</td><td>"
         << (row.duplicate_of >= 0 ? std::to_string(row.duplicate_of) : "-") << "</td><td"
         << (flags == "-" ? ">" : " class=\"flag\">") << Escape(flags) << "</td><td>";
    for (const YAML::Node& problem : r["problems"]) {
      html << Escape(problem["message"].as<std::string>("")) << "<br>";
    }
    html << "</td></tr>\n";
  }
  html << "</table>\n<p>Drawings: the cell seen obliquely, atoms of the cell only (no periodic "
          "images), colours from nucleate's own palette.</p>\n</body></html>\n";
  return html.str();
}

}  // namespace nucleate::cli
