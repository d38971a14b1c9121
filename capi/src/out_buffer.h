// Buffers handed to the caller: malloc'd here, released by nucleate_free (free).
#pragma once

#include <cstdlib>
#include <cstring>
#include <string>

namespace nucleate::capi {

// A copy with one extra NUL, so JSON replies and messages are C strings as well; NULL when
// memory ran out.
inline char* CopyOut(const void* data, size_t size) {
  char* out = static_cast<char*>(std::malloc(size + 1));
  if (out == nullptr) return nullptr;
  if (size > 0) std::memcpy(out, data, size);
  out[size] = '\0';
  return out;
}

inline char* CopyOut(const std::string& bytes) { return CopyOut(bytes.data(), bytes.size()); }

}  // namespace nucleate::capi
