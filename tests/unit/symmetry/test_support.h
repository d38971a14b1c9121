// Small helpers shared by the symmetry unit tests.
#pragma once

#include <algorithm>
#include <string>
#include <vector>

#include "core/structure/crystal.h"
#include "core/symmetry/symmetry.h"

namespace nucleate::symmetry::testing {

// "Z:letter ..." of an asymmetric unit, sorted: compared with the Tables' descriptions.
inline std::string WyckoffDescription(const std::vector<AsymmetricSite>& unit) {
  std::vector<std::string> parts;
  for (const auto& s : unit) parts.push_back(std::to_string(s.number) + ":" + s.wyckoff);
  std::sort(parts.begin(), parts.end(), [](const std::string& a, const std::string& b) {
    const int za = std::stoi(a), zb = std::stoi(b);
    return za != zb ? za < zb : a < b;
  });
  std::string out;
  for (const auto& p : parts) out += (out.empty() ? "" : " ") + p;
  return out;
}

}  // namespace nucleate::symmetry::testing
