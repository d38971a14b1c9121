// SHA-256 (FIPS 180-4), for checksums of files nucleate writes (model bundles, checkpoints,
// data sets). A checksum here detects damage, not tampering: the digest travels with the data.
#pragma once

#include <array>
#include <cstddef>
#include <cstdint>
#include <string>

namespace nucleate {

using Sha256Digest = std::array<std::uint8_t, 32>;

// Streaming form: Update any number of times with any split of the message, then Finish once.
// The result equals Sha256(whole message) whatever the split.
class Sha256Hasher {
 public:
  Sha256Hasher();
  void Update(const void* data, std::size_t size);
  void Update(const std::string& bytes) { Update(bytes.data(), bytes.size()); }
  // The digest; the hasher is spent afterwards (further calls give an unspecified digest).
  Sha256Digest Finish();

 private:
  void CompressBlock(const std::uint8_t* block);

  std::array<std::uint32_t, 8> state_;
  std::array<std::uint8_t, 64> pending_{};  // bytes of an unfinished block
  std::size_t pending_size_ = 0;
  std::uint64_t message_bytes_ = 0;
};

Sha256Digest Sha256(const void* data, std::size_t size);
inline Sha256Digest Sha256(const std::string& bytes) { return Sha256(bytes.data(), bytes.size()); }

// 64 lowercase hexadecimal digits, the form printed by sha256sum and stored in provenance records.
std::string ToHex(const Sha256Digest& digest);

}  // namespace nucleate
