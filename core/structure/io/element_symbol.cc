#include "core/structure/io/element_symbol.h"

#include <string>

#include "core/elements/elements.h"

namespace nucleate::structure::io {

namespace {

bool IsUpper(char c) { return c >= 'A' && c <= 'Z'; }
bool IsLower(char c) { return c >= 'a' && c <= 'z'; }
bool IsLetter(char c) { return IsUpper(c) || IsLower(c); }
char ToUpper(char c) { return IsLower(c) ? static_cast<char>(c - 'a' + 'A') : c; }
char ToLower(char c) { return IsUpper(c) ? static_cast<char>(c - 'A' + 'a') : c; }

}  // namespace

std::string_view LeadingLetters(std::string_view text) {
  std::size_t n = 0;
  while (n < text.size() && IsLetter(text[n])) ++n;
  return text.substr(0, n);
}

int AtomicNumberFromTypeSymbol(std::string_view text) {
  const std::string_view letters = LeadingLetters(text);
  if (letters.empty() || letters.size() > 2) return 0;
  for (char c : text.substr(letters.size())) {
    if (!((c >= '0' && c <= '9') || c == '+' || c == '-')) return 0;
  }
  std::string symbol(1, ToUpper(letters[0]));
  if (letters.size() == 2) symbol.push_back(ToLower(letters[1]));
  return elements::AtomicNumber(symbol);
}

int AtomicNumberFromSiteLabel(std::string_view text) {
  const std::string_view letters = LeadingLetters(text);
  if (letters.empty()) return 0;
  if (letters.size() >= 2 && IsLower(letters[1])) {
    const std::string two{ToUpper(letters[0]), letters[1]};
    if (const int z = elements::AtomicNumber(two)) return z;
  }
  return elements::AtomicNumber(std::string(1, ToUpper(letters[0])));
}

}  // namespace nucleate::structure::io
