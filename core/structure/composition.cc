#include "core/structure/composition.h"

#include <algorithm>
#include <cctype>
#include <numeric>
#include <string_view>
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

namespace {

// Recursive descent over: formula = { group }, group = (symbol | "(" formula ")") [count].
class FormulaReader {
 public:
  FormulaReader(const std::string& text, const std::string& field) : s_(text), field_(field) {}

  std::vector<std::pair<int, long long>> Read() {
    auto terms = Sequence(0);
    if (pos_ < s_.size()) Fail("unexpected ')'");
    if (terms.empty()) Fail("no elements");
    return terms;
  }

 private:
  [[noreturn]] void Fail(const std::string& what) const { FailAt(pos_, what); }
  [[noreturn]] void FailAt(std::size_t at, const std::string& what) const {
    throw InvalidArgument(field_, what + " at character " + std::to_string(at + 1) + " of \"" +
                                      s_ + "\"");
  }
  void SkipSpaces() {
    while (pos_ < s_.size() && s_[pos_] == ' ') ++pos_;
  }
  // Errors point at the first digit of the count.
  long long Count() {
    SkipSpaces();
    if (pos_ >= s_.size() || !std::isdigit(static_cast<unsigned char>(s_[pos_]))) return 1;
    const std::size_t start = pos_;
    long long n = 0;
    while (pos_ < s_.size() && std::isdigit(static_cast<unsigned char>(s_[pos_]))) {
      n = 10 * n + (s_[pos_++] - '0');
      if (n > 1000000) FailAt(start, "count above 1000000");
    }
    if (n == 0) FailAt(start, "count 0");
    return n;
  }
  std::vector<std::pair<int, long long>> Sequence(int depth) {
    if (depth > 8) Fail("parentheses nested too deeply");
    std::vector<std::pair<int, long long>> terms;
    const auto add = [&](int z, long long n) {
      for (auto& t : terms) {
        if (t.first == z) {
          t.second += n;
          if (t.second > 1000000) Fail("count above 1000000");
          return;
        }
      }
      terms.emplace_back(z, n);
    };
    for (SkipSpaces(); pos_ < s_.size(); SkipSpaces()) {
      const char c = s_[pos_];
      if (c == ')') {
        if (depth == 0) Fail("unexpected ')'");
        return terms;
      }
      if (c == '(') {
        const std::size_t open = pos_++;
        auto inner = Sequence(depth + 1);
        if (pos_ >= s_.size() || s_[pos_] != ')') Fail("missing ')'");
        if (inner.empty()) FailAt(open, "empty parentheses");
        ++pos_;
        const std::size_t count_at = pos_;
        const long long n = Count();
        for (const auto& [z, m] : inner) {
          if (m * n > 1000000) FailAt(count_at, "count above 1000000");
          add(z, m * n);
        }
        continue;
      }
      if (!std::isupper(static_cast<unsigned char>(c))) Fail("expected an element symbol");
      std::size_t end = pos_ + 1;
      while (end < s_.size() && std::islower(static_cast<unsigned char>(s_[end]))) ++end;
      const int z = elements::AtomicNumber(std::string_view(s_).substr(pos_, end - pos_));
      if (z == 0) Fail("unknown element '" + s_.substr(pos_, end - pos_) + "'");
      pos_ = end;
      add(z, Count());
    }
    return terms;
  }

  const std::string& s_;
  const std::string& field_;
  std::size_t pos_ = 0;
};

}  // namespace

std::vector<std::pair<int, int>> ParseFormula(const std::string& formula, const std::string& field) {
  std::vector<std::pair<int, int>> out;
  for (const auto& [z, n] : FormulaReader(formula, field).Read()) {
    out.emplace_back(z, static_cast<int>(n));
  }
  return out;
}

}  // namespace nucleate::structure
