#include "core/structure/composition.h"

#include <algorithm>
#include <numeric>
#include <utility>

#include "core/common/error.h"
#include "core/elements/elements.h"

namespace nucleate::structure {
namespace {

std::string Formula(const std::map<int, long long>& counts, long long divisor,
                    const std::string& separator) {
  std::vector<std::pair<std::string, long long>> terms;
  for (const auto& [number, count] : counts) {
    const elements::Element* element = elements::FindElement(number);
    if (element == nullptr) {
      throw InvalidArgument("atomic_numbers", "not an atomic number in 1..118: " +
                                                  std::to_string(number));
    }
    if (count > 0) terms.emplace_back(element->symbol, count / divisor);
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
    if (!out.empty()) out += separator;
    out += symbol;
    if (count != 1) out += std::to_string(count);
  }
  return out;
}

}  // namespace

std::map<int, long long> CountElements(const std::vector<int>& numbers) {
  std::map<int, long long> counts;
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
  return Formula(CountElements(numbers), 1, "");
}

std::string HillFormula(const std::map<int, long long>& counts, const std::string& separator) {
  return Formula(counts, 1, separator);
}

std::string ReducedHillFormula(const std::vector<int>& numbers) {
  const std::map<int, long long> counts = CountElements(numbers);
  long long divisor = 0;
  for (const auto& entry : counts) divisor = std::gcd(divisor, entry.second);
  return Formula(counts, std::max(divisor, 1LL), "");
}

}  // namespace nucleate::structure
