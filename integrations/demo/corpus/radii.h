// The radii that set the size of every corpus cell: effective ionic radii for ionic phases and
// metallic radii for intermetallic-like ones. Sources and the caveats of typing them in are at the
// head of radii.cc.
#pragma once

#include <vector>

namespace nucleate::demo::corpus {

// One entry of Shannon's table: an ion in one coordination (and spin state, where Shannon lists
// two).
struct IonicRadius {
  const char* symbol;
  int charge;
  int coordination;  // number of nearest neighbours: 2, 4, 6, 7, 8, 12
  const char* spin;  // "" or the label Shannon's table uses: "High Spin", "Low Spin"
  double radius;     // angstrom
};

struct MetallicRadius {
  const char* symbol;
  double radius;  // angstrom, for 12-fold coordination
};

const std::vector<IonicRadius>& IonicRadii();
const std::vector<MetallicRadius>& MetallicRadii();

// Look-ups by atomic number. A missing entry is a mistake in the structure-type tables, so it
// raises nucleate::Error (kInternal) naming the ion and coordination.
double IonicRadiusOf(int number, int charge, int coordination);
double MetallicRadiusOf(int number);

}  // namespace nucleate::demo::corpus
