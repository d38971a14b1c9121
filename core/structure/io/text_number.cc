#include "core/structure/io/text_number.h"

#include <charconv>
#include <cmath>

namespace nucleate::structure::io {

namespace {

bool IsDigit(char c) { return c >= '0' && c <= '9'; }

// Checks the decimal grammar by hand: from_chars alone would also accept "nan" and "inf", and
// stops silently at the first character it does not understand.
bool IsDecimalGrammar(std::string_view s) {
  std::size_t i = 0;
  if (i < s.size() && (s[i] == '+' || s[i] == '-')) ++i;
  std::size_t digits = 0;
  while (i < s.size() && IsDigit(s[i])) ++i, ++digits;
  if (i < s.size() && s[i] == '.') {
    ++i;
    while (i < s.size() && IsDigit(s[i])) ++i, ++digits;
  }
  if (digits == 0) return false;
  if (i < s.size() && (s[i] == 'e' || s[i] == 'E')) {
    ++i;
    if (i < s.size() && (s[i] == '+' || s[i] == '-')) ++i;
    std::size_t exponent_digits = 0;
    while (i < s.size() && IsDigit(s[i])) ++i, ++exponent_digits;
    if (exponent_digits == 0) return false;
  }
  return i == s.size();
}

}  // namespace

std::optional<double> ParseDecimal(std::string_view text) {
  if (!IsDecimalGrammar(text)) return std::nullopt;
  // from_chars rejects a leading '+'.
  if (text.front() == '+') text.remove_prefix(1);
  double value = 0;
  const auto [end, ec] = std::from_chars(text.data(), text.data() + text.size(), value);
  if (ec != std::errc() || end != text.data() + text.size() || !std::isfinite(value)) {
    return std::nullopt;  // out of range ("1e999") is not a usable number either
  }
  return value;
}

std::optional<double> ParseCifNumber(std::string_view text) {
  const std::size_t open = text.find('(');
  if (open == std::string_view::npos) return ParseDecimal(text);
  // The uncertainty must be digits in one closing pair of parentheses at the very end.
  if (text.size() < open + 3 || text.back() != ')') return std::nullopt;
  for (std::size_t i = open + 1; i + 1 < text.size(); ++i) {
    if (!IsDigit(text[i])) return std::nullopt;
  }
  return ParseDecimal(text.substr(0, open));
}

std::string FormatFixed(double value, int decimals) {
  char buffer[128];
  const auto [end, ec] =
      std::to_chars(buffer, buffer + sizeof(buffer), value, std::chars_format::fixed, decimals);
  if (ec != std::errc()) return "?";  // cannot happen for the finite, bounded values we write
  std::string text(buffer, end);
  if (text.front() == '-' && text.find_first_not_of("-0.") == std::string::npos) {
    text.erase(0, 1);
  }
  return text;
}

}  // namespace nucleate::structure::io
