// Whole-file reads and writes for the files nucleate seals (bundles, checkpoints).
#pragma once

#include <cstdint>
#include <string>

namespace nucleate::model {

// The bytes of the regular file at `path`. Its size is checked against max_bytes before anything
// is read or allocated (LimitExceeded); other failures are kIo errors. Both name the path.
std::string ReadFileWithLimit(const std::string& path, std::uint64_t max_bytes);

// Writes `bytes` to path + ".tmp", forces them to disk, then renames over `path`. A crash or a
// full disk at any moment leaves either the old file or the new one, never half of one; on
// failure the .tmp file is removed and a kIo error names the path.
void WriteFileAtomically(const std::string& path, const std::string& bytes);

}  // namespace nucleate::model
