#include "atomic_file.h"

#include <fcntl.h>
#include <unistd.h>

#include <cerrno>
#include <cstring>
#include <stdexcept>

namespace nucleate::cli {

void WriteFileAtomically(const std::string& path, const std::string& bytes) {
  const std::string temporary = path + ".tmp";
  const int fd = ::open(temporary.c_str(), O_WRONLY | O_CREAT | O_TRUNC | O_CLOEXEC, 0644);
  if (fd < 0) {
    throw std::runtime_error("cannot create '" + temporary + "': " + std::strerror(errno));
  }
  const auto fail = [&](const std::string& what) {
    const std::string reason = std::strerror(errno);
    ::close(fd);
    ::unlink(temporary.c_str());
    return std::runtime_error(what + " '" + path + "': " + reason);
  };
  std::size_t done = 0;
  while (done < bytes.size()) {
    const ssize_t n = ::write(fd, bytes.data() + done, bytes.size() - done);
    if (n < 0 && errno == EINTR) continue;  // Ctrl-C while writing: keep writing
    if (n < 0) throw fail("cannot write");
    done += static_cast<std::size_t>(n);
  }
  // On disk before the rename makes the file visible under its final name.
  if (::fsync(fd) != 0) throw fail("cannot flush");
  if (::close(fd) != 0) {
    const std::string reason = std::strerror(errno);
    ::unlink(temporary.c_str());
    throw std::runtime_error("cannot close '" + path + "': " + reason);
  }
  if (::rename(temporary.c_str(), path.c_str()) != 0) {
    const std::string reason = std::strerror(errno);
    ::unlink(temporary.c_str());
    throw std::runtime_error("cannot rename '" + temporary + "' to '" + path + "': " + reason);
  }
}

}  // namespace nucleate::cli
