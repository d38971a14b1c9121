#include "core/structure/composition.h"

#include <algorithm>
#include <numeric>
#include <utility>

#include "core/common/error.h"
#include "core/elements/elements.h"

namespace nucleate::structure {
namespace {

std::string Formula(const std::map<int, int>& counts, int divisor) {
  std::vector<std::pair<std::string, int>> terms;
  for (const auto& [number, count] : counts) {
    terms.emplace_back(elements::FindElement(number)->symbol, count / divisor);
  }
  const bool has_carbon = counts.count(6) > 0;
  auto rank = [has_carbon](const std::string& symbol) {
    if (has_carbon && symbol == "C") return 0;
    if (has_carbon && symbol == "H") return 1;
    return 2;
  };
  std::sort(terms.begin(), terms.end(), [&](const auto& x, const auto& y) {
    return std::make_pair(rank(x.first), x.first) < std::make_pair(rank(y.first), y.first);
  });
  std::string out;
  for (const auto& [symbol, count] : terms) {
    out += symbol;
    if (count != 1) out += std::to_string(count);
  }
  return out;
}

}  // namespace

std::map<int, int> CountElements(const std::vector<int>& numbers) {
  std::map<int, int> counts;
  for (std::size_t i = 0; i < numbers.size(); ++i) {
    if (elements::FindElement(numbers[i]) == nullptr) {
      throw InvalidArgument("atomic_numbers[" + std::to_string(i) + "]",
                            "not an atomic number in 1..118: " + std::to_string(numbers[i]));
    }
    ++counts[numbers[i]];
  }
  return counts;
}

std::string HillFormula(const std::vector<int>& numbers) {
  return Formula(CountElements(numbers), 1);
}

std::string ReducedHillFormula(const std::vector<int>& numbers) {
  const std::map<int, int> counts = CountElements(numbers);
  int divisor = 0;
  for (const auto& entry : counts) divisor = std::gcd(divisor, entry.second);
  return Formula(counts, std::max(divisor, 1));
}

}  // namespace nucleate::structure
