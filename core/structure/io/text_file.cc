#include "core/structure/io/text_file.h"

#include <cerrno>
#include <fstream>
#include <system_error>

#include "core/common/error.h"

namespace nucleate::structure::io {

namespace {

std::string Reason() {
  // std::generic_category().message is thread-safe, unlike strerror.
  return errno != 0 ? std::generic_category().message(errno) : std::string("unknown error");
}

}  // namespace

std::string ReadTextFile(const std::string& path, std::int64_t max_bytes) {
  errno = 0;
  std::ifstream in(path, std::ios::binary);
  if (!in) throw Error(ErrorKind::kIo, path, "cannot open for reading: " + Reason());
  in.seekg(0, std::ios::end);
  const std::streamoff size = in.tellg();
  if (size < 0) throw Error(ErrorKind::kIo, path, "cannot determine the file size");
  if (size > max_bytes) {
    throw LimitExceeded(path, "file is " + std::to_string(size) + " bytes, above the limit of " +
                                  std::to_string(max_bytes) + " bytes");
  }
  in.seekg(0, std::ios::beg);
  std::string text(static_cast<std::size_t>(size), '\0');
  if (size > 0 && !in.read(text.data(), size)) {
    throw Error(ErrorKind::kIo, path, "read failed: " + Reason());
  }
  return text;
}

void WriteTextFile(const std::string& path, std::string_view text) {
  errno = 0;
  std::ofstream out(path, std::ios::binary | std::ios::trunc);
  if (!out) throw Error(ErrorKind::kIo, path, "cannot open for writing: " + Reason());
  out.write(text.data(), static_cast<std::streamsize>(text.size()));
  out.flush();
  if (!out) throw Error(ErrorKind::kIo, path, "write failed: " + Reason());
}

}  // namespace nucleate::structure::io
