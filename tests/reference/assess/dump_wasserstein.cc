// Prints nucleate's Wasserstein-1 distance for the reference script beside it.
//
// Usage: dump_wasserstein CASES.txt
// CASES.txt holds one case per line: "n m a_1 .. a_n b_1 .. b_m" -> "ok W1", or "error <field>"
// for a refused case.
#include <cstdio>
#include <cstdlib>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

#include "core/assess/wasserstein.h"
#include "core/common/error.h"

int main(int argc, char** argv) {
  if (argc != 2) {
    std::fprintf(stderr, "usage: dump_wasserstein CASES.txt\n");
    return 2;
  }
  std::ifstream in(argv[1]);
  std::string line;
  while (std::getline(in, line)) {
    std::istringstream fields(line);
    long n = -1, m = -1;
    fields >> n >> m;
    std::vector<double> values;
    // strtod, not operator>>, so that "nan" and "inf" reach the library as such.
    for (std::string token; fields >> token;) values.push_back(std::strtod(token.c_str(), nullptr));
    if (n < 0 || m < 0 || static_cast<long>(values.size()) != n + m) {
      std::fprintf(stderr, "malformed case line '%s'\n", line.c_str());
      return 2;
    }
    const std::vector<double> a(values.begin(), values.begin() + n);
    const std::vector<double> b(values.begin() + n, values.end());
    try {
      std::printf("ok %.17g\n", nucleate::assess::Wasserstein1(a, b));
    } catch (const nucleate::Error& e) {
      std::printf("error %s\n", e.field().c_str());
    }
  }
  return 0;
}
