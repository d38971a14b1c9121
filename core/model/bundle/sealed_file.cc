#include "core/model/bundle/sealed_file.h"

#include <algorithm>

#include "core/common/error.h"
#include "core/common/message_text.h"
#include "core/common/sha256.h"
#include "nucleate/v1/model.pb.h"

namespace nucleate::model {
namespace {

// The file begins with field 1 (magic) because protobuf writes fields in number order: tag byte
// 0x0A (field 1, length-delimited), the length as a varint, then the magic itself.
std::string ExpectedHeader(const std::string& magic) {
  std::string header(1, '\x0a');
  for (std::uint64_t n = magic.size();; n >>= 7) {
    if (n < 0x80) {
      header.push_back(static_cast<char>(n));
      break;
    }
    header.push_back(static_cast<char>((n & 0x7f) | 0x80));
  }
  return header + magic;
}

// A magic read from a foreign file goes into an error message: keep it short and printable.
std::string Printable(const std::string& text) {
  std::string out;
  for (char c : text.substr(0, 64)) out.push_back(c >= 0x20 && c < 0x7f ? c : '?');
  if (text.size() > 64) out += "...";
  return out;
}

}  // namespace

std::string SealFile(const std::string& magic, std::uint32_t format_version,
                     const std::string& payload) {
  if (magic.empty()) throw InvalidArgument("magic", "must not be empty");
  if (format_version == 0) throw InvalidArgument("format_version", "must be >= 1");
  v1::SealedFile file;
  file.set_magic(magic);
  file.set_format_version(format_version);
  file.set_payload(payload);
  const Sha256Digest digest = Sha256(payload);
  file.set_sha256(digest.data(), digest.size());
  std::string bytes;
  if (!file.SerializeToString(&bytes)) {
    throw Error(ErrorKind::kLimitExceeded, "payload",
                "too large to seal (" + std::to_string(payload.size()) + " bytes)");
  }
  return bytes;
}

UnsealedFile UnsealFile(const std::string& bytes, const std::string& expected_magic,
                        std::uint32_t newest_format_version, std::uint64_t max_bytes,
                        const std::string& source) {
  const std::string kind_of_file = "'" + expected_magic + "' file";
  if (bytes.size() > max_bytes) {
    throw LimitExceeded(source, "is " + std::to_string(bytes.size()) +
                                    " bytes, above the limit of " + std::to_string(max_bytes) +
                                    " bytes");
  }
  if (bytes.empty()) throw InvalidArgument(source, "is empty (truncated " + kind_of_file + "?)");

  // A file that does not start like ours is something else; say so instead of "damaged".
  const std::string header = ExpectedHeader(expected_magic);
  const std::size_t compared = std::min(bytes.size(), header.size());
  const bool starts_like_ours = bytes.compare(0, compared, header, 0, compared) == 0;

  v1::SealedFile file;
  // Parsing bounds every length by the bytes present, so a damaged length cannot make it
  // allocate more than the input's size.
  if (!ParseQuietly(bytes, &file)) {
    if (!starts_like_ours) throw InvalidArgument(source, "is not a " + kind_of_file);
    throw InvalidArgument(
        source, "is truncated or damaged: the " + kind_of_file + " container cannot be parsed");
  }
  if (file.magic() != expected_magic) {
    throw InvalidArgument(
        source, "is not a " + kind_of_file + " (its magic is '" + Printable(file.magic()) + "')");
  }
  if (file.format_version() == 0) {
    throw InvalidArgument(source, "is truncated or damaged: it has no format version");
  }
  if (file.format_version() > newest_format_version) {
    throw Error(ErrorKind::kUnsupported, source,
                "has format version " + std::to_string(file.format_version()) +
                    "; this library reads " + kind_of_file + "s up to version " +
                    std::to_string(newest_format_version) + " (a newer nucleate wrote it)");
  }
  if (file.sha256().size() != 32) {
    throw InvalidArgument(source, "is truncated or damaged: its SHA-256 checksum is " +
                                      std::to_string(file.sha256().size()) +
                                      " bytes instead of 32");
  }
  const Sha256Digest digest = Sha256(file.payload());
  if (file.sha256().compare(0, 32, reinterpret_cast<const char*>(digest.data()), 32) != 0) {
    throw InvalidArgument(source,
                          "is corrupted: the SHA-256 of its payload does not match the "
                          "checksum stored in the file");
  }
  UnsealedFile result;
  result.format_version = file.format_version();
  result.payload = std::move(*file.mutable_payload());
  return result;
}

}  // namespace nucleate::model
