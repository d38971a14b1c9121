// Whole-file reads and writes for the text formats, with the size checked before allocating.
#pragma once

#include <cstdint>
#include <string>
#include <string_view>

namespace nucleate::structure::io {

// Throws nucleate::Error kIo (field = path) when the file cannot be opened or read, and
// kLimitExceeded when it is larger than max_bytes.
std::string ReadTextFile(const std::string& path, std::int64_t max_bytes);

// Throws kIo (field = path) when the file cannot be written completely.
void WriteTextFile(const std::string& path, std::string_view text);

}  // namespace nucleate::structure::io
