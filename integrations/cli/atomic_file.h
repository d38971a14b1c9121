// Output files that are either absent or complete: a reader (or a crash, or a second Ctrl-C)
// never sees half a candidate file. The library's own helper (core/model/bundle/file_io.h) is
// not exported from libnucleate.so, and the CLI reaches the library only through the C ABI.
#pragma once

#include <string>

namespace nucleate::cli {

// Writes `bytes` to path + ".tmp", flushes them to disk, then renames over `path`. Throws
// std::runtime_error naming the path on failure (the temporary file is removed).
void WriteFileAtomically(const std::string& path, const std::string& bytes);

}  // namespace nucleate::cli
