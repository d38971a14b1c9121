#include "core/model/bundle/file_io.h"

#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>

#include <cerrno>
#include <cstdio>
#include <cstring>

#include "core/common/error.h"

namespace nucleate::model {
namespace {

Error IoError(const std::string& path, const std::string& what, int error_number) {
  return Error(ErrorKind::kIo, path, what + ": " + std::strerror(error_number));
}

// Closes on every path out, including exceptions.
class FileDescriptor {
 public:
  explicit FileDescriptor(int fd) : fd_(fd) {}
  ~FileDescriptor() {
    if (fd_ >= 0) ::close(fd_);
  }
  FileDescriptor(const FileDescriptor&) = delete;
  FileDescriptor& operator=(const FileDescriptor&) = delete;
  int get() const { return fd_; }
  // close() reports write-back errors on some file systems, so a writer must look at its result.
  int Close() {
    const int result = ::close(fd_);
    fd_ = -1;
    return result;
  }

 private:
  int fd_;
};

std::string DirectoryOf(const std::string& path) {
  const std::size_t slash = path.find_last_of('/');
  if (slash == std::string::npos) return ".";
  return slash == 0 ? "/" : path.substr(0, slash);
}

}  // namespace

std::string ReadFileWithLimit(const std::string& path, std::uint64_t max_bytes) {
  FileDescriptor fd(::open(path.c_str(), O_RDONLY | O_CLOEXEC));
  if (fd.get() < 0) throw IoError(path, "cannot open for reading", errno);
  // fstat on the opened file, not stat on the name: the size belongs to the file we will read.
  struct stat info;
  if (::fstat(fd.get(), &info) != 0) throw IoError(path, "cannot read its size", errno);
  if (!S_ISREG(info.st_mode)) throw Error(ErrorKind::kIo, path, "is not a regular file");
  const auto size = static_cast<std::uint64_t>(info.st_size);
  if (size > max_bytes) {
    throw LimitExceeded(path, "is " + std::to_string(size) + " bytes, above the limit of " +
                                  std::to_string(max_bytes) + " bytes");
  }
  std::string bytes(static_cast<std::size_t>(size), '\0');
  std::size_t done = 0;
  while (done < bytes.size()) {
    const ssize_t n = ::read(fd.get(), &bytes[done], bytes.size() - done);
    if (n < 0 && errno == EINTR) continue;
    if (n < 0) throw IoError(path, "cannot read", errno);
    if (n == 0) {
      throw Error(ErrorKind::kIo, path,
                  "shrank while being read (" + std::to_string(done) + " of " +
                      std::to_string(size) + " bytes)");
    }
    done += static_cast<std::size_t>(n);
  }
  return bytes;
}

void WriteFileAtomically(const std::string& path, const std::string& bytes) {
  const std::string temporary = path + ".tmp";
  FileDescriptor fd(::open(temporary.c_str(), O_WRONLY | O_CREAT | O_TRUNC | O_CLOEXEC, 0644));
  if (fd.get() < 0) throw IoError(temporary, "cannot create", errno);
  const auto fail = [&](const std::string& what) {
    const int error_number = errno;
    if (fd.get() >= 0) fd.Close();
    ::unlink(temporary.c_str());
    return IoError(path, what, error_number);
  };
  std::size_t done = 0;
  while (done < bytes.size()) {
    const ssize_t n = ::write(fd.get(), bytes.data() + done, bytes.size() - done);
    if (n < 0 && errno == EINTR) continue;
    if (n < 0) throw fail("cannot write " + temporary);
    done += static_cast<std::size_t>(n);
  }
  // The data must be on disk before the rename makes it visible under the final name.
  if (::fsync(fd.get()) != 0) throw fail("cannot flush " + temporary + " to disk");
  if (fd.Close() != 0) throw fail("cannot close " + temporary);
  if (::rename(temporary.c_str(), path.c_str()) != 0) {
    throw fail("cannot rename " + temporary + " to the final name");
  }
  // Make the rename itself durable. Some file systems refuse fsync on a directory; the file is
  // complete either way, so that failure is not an error.
  FileDescriptor directory(::open(DirectoryOf(path).c_str(), O_RDONLY | O_DIRECTORY | O_CLOEXEC));
  if (directory.get() >= 0) ::fsync(directory.get());
}

}  // namespace nucleate::model
