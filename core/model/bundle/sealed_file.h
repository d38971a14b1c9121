// The container every file nucleate seals: a magic string saying what the file is, the payload's
// format version, the payload, and its SHA-256 (message SealedFile in
// schemas/nucleate/v1/model.proto). Model bundles use magic "nucleate-model"; training
// checkpoints can use "nucleate-checkpoint" with the same two functions.
#pragma once

#include <cstdint>
#include <string>

namespace nucleate::model {

// The bytes of a SealedFile holding `payload`. InvalidArgument for an empty magic or version 0.
std::string SealFile(const std::string& magic, std::uint32_t format_version,
                     const std::string& payload);

struct UnsealedFile {
  std::uint32_t format_version = 0;  // 1..newest_format_version
  std::string payload;               // checksum verified
};

// Opens the bytes of a sealed file. Every error names `source` (the file path, or a label for
// bytes from memory) as its field and says what is wrong:
// - LimitExceeded: more than max_bytes bytes;
// - InvalidArgument: not a sealed file with `expected_magic` ("is not a ... file"), truncated or
//   damaged ("truncated"), checksum mismatch ("corrupted");
// - Unsupported: a format version newer than newest_format_version (both versions named).
// Memory used is bounded by a small multiple of bytes.size(): nothing is sized by a number read
// from the file without checking it against the bytes present.
UnsealedFile UnsealFile(const std::string& bytes, const std::string& expected_magic,
                        std::uint32_t newest_format_version, std::uint64_t max_bytes,
                        const std::string& source);

}  // namespace nucleate::model
