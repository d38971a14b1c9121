// Reads byte strings, one per line as hex digits on stdin, and prints for each whether it is
// UTF-8 (1 or 0) and its repaired form as hex: "<valid> <hex>". utf8_reference.py compares both
// with Python's own decoder.
#include <cstdio>
#include <iostream>
#include <string>

#include "core/common/utf8.h"

namespace {

std::string FromHex(const std::string& hex) {
  std::string bytes;
  for (std::size_t i = 0; i + 1 < hex.size(); i += 2) {
    bytes += static_cast<char>(std::stoi(hex.substr(i, 2), nullptr, 16));
  }
  return bytes;
}

std::string ToHex(const std::string& bytes) {
  static const char* digits = "0123456789abcdef";
  std::string hex;
  for (unsigned char c : bytes) {
    hex += digits[c >> 4];
    hex += digits[c & 15];
  }
  return hex;
}

}  // namespace

int main() {
  std::string line;
  while (std::getline(std::cin, line)) {
    const std::string bytes = FromHex(line);
    std::cout << (nucleate::IsValidUtf8(bytes) ? 1 : 0) << ' ' << ToHex(nucleate::RepairUtf8(bytes))
              << '\n';
  }
  return 0;
}
