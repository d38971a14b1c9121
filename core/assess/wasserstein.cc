#include "core/assess/wasserstein.h"

#include <algorithm>
#include <cmath>
#include <cstddef>

#include "core/common/error.h"

namespace nucleate::assess {
namespace {

void RequireSample(const char* field, const std::vector<double>& values) {
  if (values.empty()) throw InvalidArgument(field, "no values: a distribution needs at least one");
  for (std::size_t k = 0; k < values.size(); ++k) {
    if (!std::isfinite(values[k])) {
      throw InvalidArgument(field, "value " + std::to_string(k) + " is not a finite number");
    }
  }
}

}  // namespace

double Wasserstein1(std::vector<double> a, std::vector<double> b) {
  RequireSample("a", a);
  RequireSample("b", b);
  std::sort(a.begin(), a.end());
  std::sort(b.begin(), b.end());
  const double n = static_cast<double>(a.size());
  const double m = static_cast<double>(b.size());
  // Walk the merged values in ascending order; i and j count the values of a and b at or below
  // the current point x, so |i / n - j / m| is |F - G| on [x, next).
  std::size_t i = 0, j = 0;
  double x = std::min(a.front(), b.front());
  double total = 0;
  while (i < a.size() || j < b.size()) {
    while (i < a.size() && a[i] <= x) ++i;
    while (j < b.size() && b[j] <= x) ++j;
    if (i == a.size() && j == b.size()) break;
    const double next = std::min(i < a.size() ? a[i] : b[j], j < b.size() ? b[j] : a[i]);
    total += (next - x) * std::abs(static_cast<double>(i) / n - static_cast<double>(j) / m);
    x = next;
  }
  return total;
}

}  // namespace nucleate::assess
