// Numbers in messages and files: the shortest text that reads back to exactly the same double
// ("1e-300", "0.1"), never std::to_string's fixed six decimals ("0.000000" for 1e-300, 300
// digits for 1e300).
#pragma once

#include <charconv>
#include <string>
#include <system_error>

namespace nucleate {

inline std::string FormatShortest(double value) {
  char buffer[64];
  const auto [end, ec] = std::to_chars(buffer, buffer + sizeof(buffer), value);
  if (ec != std::errc()) return "nan";
  return std::string(buffer, end);
}

}  // namespace nucleate
