#include "core/common/utf8.h"

#include <cstddef>

namespace nucleate {
namespace {

constexpr std::string_view kReplacement = "\xEF\xBF\xBD";  // U+FFFD

// The sequence starting at text[i]: a well-formed character of `length` bytes, or an ill-formed
// one whose maximal subpart (the longest prefix that could still begin a character) is `length`
// bytes, at least 1. Unicode 15.0, section 3.9, Table 3-7 gives the byte ranges.
struct Sequence {
  std::size_t length;
  bool valid;
};

Sequence SequenceAt(std::string_view text, std::size_t i) {
  const auto byte = [&](std::size_t k) { return static_cast<unsigned char>(text[k]); };
  const unsigned char lead = byte(i);
  if (lead < 0x80) return {1, true};
  std::size_t length;
  unsigned char low = 0x80, high = 0xBF;  // allowed range of the second byte
  if (lead >= 0xC2 && lead <= 0xDF) {
    length = 2;
  } else if (lead >= 0xE0 && lead <= 0xEF) {
    length = 3;
    if (lead == 0xE0) low = 0xA0;   // overlong
    if (lead == 0xED) high = 0x9F;  // surrogates
  } else if (lead >= 0xF0 && lead <= 0xF4) {
    length = 4;
    if (lead == 0xF0) low = 0x90;   // overlong
    if (lead == 0xF4) high = 0x8F;  // above U+10FFFF
  } else {
    return {1, false};
  }
  for (std::size_t k = 1; k < length; ++k) {
    const bool fits = i + k < text.size() && byte(i + k) >= (k == 1 ? low : 0x80) &&
                      byte(i + k) <= (k == 1 ? high : 0xBF);
    if (!fits) return {k, false};
  }
  return {length, true};
}

}  // namespace

bool IsValidUtf8(std::string_view text) {
  for (std::size_t i = 0; i < text.size();) {
    const Sequence sequence = SequenceAt(text, i);
    if (!sequence.valid) return false;
    i += sequence.length;
  }
  return true;
}

std::string RepairUtf8(std::string_view text) {
  std::string out;
  out.reserve(text.size());
  for (std::size_t i = 0; i < text.size();) {
    const Sequence sequence = SequenceAt(text, i);
    if (sequence.valid) {
      out.append(text, i, sequence.length);
    } else {
      out += kReplacement;
    }
    i += sequence.length;
  }
  return out;
}

}  // namespace nucleate
