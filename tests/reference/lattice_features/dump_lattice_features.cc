// Prints nucleate's lattice features and their inverse for the reference script beside it.
//
// Usage: dump_lattice_features CASES.txt
// CASES.txt holds one case per line:
//   L N a_x a_y a_z b_x b_y b_z c_x c_y c_z   -> "ok f0 .. f5"  (LatticeToFeatures)
//   F N f0 f1 f2 f3 f4 f5                     -> "ok l0 .. l8"  (FeaturesToLattice, row-major)
// A refused case prints "error <kind> <field>" (kind: invalid, numerical, other).
#include <cstdio>
#include <cstdlib>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

#include "core/common/error.h"
#include "core/model/lattice_features.h"

namespace {

using namespace nucleate;

const char* KindName(ErrorKind kind) {
  switch (kind) {
    case ErrorKind::kInvalidArgument: return "invalid";
    case ErrorKind::kNumerical: return "numerical";
    default: return "other";
  }
}

}  // namespace

int main(int argc, char** argv) {
  if (argc != 2) {
    std::fprintf(stderr, "usage: dump_lattice_features CASES.txt\n");
    return 2;
  }
  std::ifstream in(argv[1]);
  std::string line;
  while (std::getline(in, line)) {
    std::istringstream fields(line);
    std::string kind, count;
    std::vector<double> values;
    fields >> kind >> count;
    // strtod, not operator>>, so that "nan" reaches the library as a NaN.
    for (std::string token; fields >> token;) values.push_back(std::strtod(token.c_str(), nullptr));
    const int n = std::atoi(count.c_str());
    const std::size_t expected = kind == "L" ? 9 : kind == "F" ? 6 : 0;
    if (expected == 0 || values.size() != expected) {
      std::fprintf(stderr, "malformed case line '%s'\n", line.c_str());
      return 2;
    }
    try {
      if (kind == "L") {
        Eigen::Matrix3d lattice;
        for (int k = 0; k < 9; ++k) lattice(k / 3, k % 3) = values[k];
        const model::LatticeFeatures f = model::LatticeToFeatures(lattice, n);
        std::printf("ok");
        for (int k = 0; k < 6; ++k) std::printf(" %.17g", f[k]);
      } else {
        model::LatticeFeatures f;
        for (int k = 0; k < 6; ++k) f[k] = values[k];
        const Eigen::Matrix3d lattice = model::FeaturesToLattice(f, n);
        std::printf("ok");
        for (int k = 0; k < 9; ++k) std::printf(" %.17g", lattice(k / 3, k % 3));
      }
    } catch (const Error& e) {
      std::printf("error %s %s", KindName(e.kind()), e.field().c_str());
    }
    std::printf("\n");
  }
  return 0;
}
