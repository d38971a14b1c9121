#include "core/model/bundle/sealed_file.h"

#include <gtest/gtest.h>

#include <string>

#include "bundle_fixture.h"
#include "core/common/error.h"
#include "core/common/sha256.h"

namespace nucleate::model {
namespace {

using testing::ErrorFrom;

constexpr char kMagic[] = "nucleate-model";
constexpr std::uint64_t kNoLimit = std::uint64_t{1} << 30;

std::string Payload() {
  std::string payload;
  for (int i = 0; i < 300; ++i) payload.push_back(static_cast<char>(i * 7));
  return payload;
}

UnsealedFile Unseal(const std::string& bytes, std::uint32_t newest = 1) {
  return UnsealFile(bytes, kMagic, newest, kNoLimit, "model.bin");
}

bool Contains(const std::string& text, const std::string& part) {
  return text.find(part) != std::string::npos;
}

TEST(SealedFile, RoundTripKeepsPayloadAndVersion) {
  const std::string bytes = SealFile(kMagic, 3, Payload());
  const UnsealedFile opened = Unseal(bytes, 3);
  EXPECT_EQ(opened.format_version, 3u);
  EXPECT_EQ(opened.payload, Payload());
}

// The layout the format promises (schemas/nucleate/v1/model.proto): the magic is field 1, so a
// file starts with tag 0x0A, the magic's length and the magic, and `file` tools can recognise it;
// the last 32 bytes are the payload's SHA-256, written as field 4.
TEST(SealedFile, StartsWithTheMagicAndEndsWithThePayloadDigest) {
  const std::string bytes = SealFile(kMagic, 1, Payload());
  EXPECT_EQ(bytes.substr(0, 16), std::string("\x0a\x0enucleate-model", 16));
  const Sha256Digest digest = Sha256(Payload());
  EXPECT_EQ(bytes.substr(bytes.size() - 34, 2), std::string("\x22\x20", 2));
  EXPECT_EQ(bytes.substr(bytes.size() - 32),
            std::string(reinterpret_cast<const char*>(digest.data()), 32));
}

TEST(SealedFile, EveryTruncationIsRefusedAsTruncated) {
  const std::string bytes = SealFile(kMagic, 1, Payload());
  for (std::size_t length = 0; length < bytes.size(); ++length) {
    const Error error = ErrorFrom([&] { Unseal(bytes.substr(0, length)); });
    EXPECT_EQ(error.kind(), ErrorKind::kInvalidArgument) << length;
    EXPECT_EQ(error.field(), "model.bin");
    EXPECT_TRUE(Contains(error.detail(), "truncated")) << length << ": " << error.what();
  }
}

TEST(SealedFile, AFlippedPayloadByteIsRefusedAsCorrupted) {
  const std::string bytes = SealFile(kMagic, 1, Payload());
  const std::size_t payload_start = bytes.find(Payload());
  ASSERT_NE(payload_start, std::string::npos);
  for (std::size_t i = 0; i < Payload().size(); ++i) {
    std::string damaged = bytes;
    damaged[payload_start + i] = static_cast<char>(damaged[payload_start + i] ^ 0x01);
    const Error error = ErrorFrom([&] { Unseal(damaged); });
    EXPECT_EQ(error.kind(), ErrorKind::kInvalidArgument);
    EXPECT_TRUE(Contains(error.detail(), "corrupted")) << i << ": " << error.what();
  }
}

// Outside the payload a flip hits the magic, the version, a tag, a length or the digest; each
// must still be refused, whatever the message.
TEST(SealedFile, EverySingleBitFlipAnywhereIsRefused) {
  const std::string bytes = SealFile(kMagic, 1, Payload());
  for (std::size_t i = 0; i < bytes.size(); ++i) {
    for (int bit = 0; bit < 8; ++bit) {
      std::string damaged = bytes;
      damaged[i] = static_cast<char>(damaged[i] ^ (1 << bit));
      bool refused = false;
      try {
        Unseal(damaged);
      } catch (const Error&) {
        refused = true;
      }
      EXPECT_TRUE(refused) << "byte " << i << " bit " << bit;
    }
  }
}

TEST(SealedFile, AnotherMagicIsRefusedNamingBoth) {
  const std::string checkpoint = SealFile("nucleate-checkpoint", 1, Payload());
  const Error error = ErrorFrom([&] { Unseal(checkpoint); });
  EXPECT_EQ(error.kind(), ErrorKind::kInvalidArgument);
  EXPECT_TRUE(Contains(error.detail(), "is not a 'nucleate-model' file")) << error.what();
  EXPECT_TRUE(Contains(error.detail(), "nucleate-checkpoint")) << error.what();
}

TEST(SealedFile, ForeignBytesAreRefusedAsNotOurFile) {
  const std::string cif = "data_NaCl\n_cell_length_a 5.64\n";
  const Error error = ErrorFrom([&] { Unseal(cif); });
  EXPECT_EQ(error.kind(), ErrorKind::kInvalidArgument);
  EXPECT_TRUE(Contains(error.detail(), "is not a 'nucleate-model' file")) << error.what();
}

TEST(SealedFile, ANewerFormatVersionIsUnsupportedNamingBothVersions) {
  const std::string bytes = SealFile(kMagic, 2, Payload());
  const Error error = ErrorFrom([&] { Unseal(bytes, 1); });
  EXPECT_EQ(error.kind(), ErrorKind::kUnsupported);
  EXPECT_TRUE(Contains(error.detail(), "format version 2")) << error.what();
  EXPECT_TRUE(Contains(error.detail(), "up to version 1")) << error.what();
}

TEST(SealedFile, MoreBytesThanTheLimitAreRefusedBeforeParsing) {
  const std::string bytes = SealFile(kMagic, 1, Payload());
  const Error error =
      ErrorFrom([&] { UnsealFile(bytes, kMagic, 1, bytes.size() - 1, "model.bin"); });
  EXPECT_EQ(error.kind(), ErrorKind::kLimitExceeded);
  EXPECT_TRUE(Contains(error.detail(), "limit")) << error.what();
  EXPECT_NO_THROW(UnsealFile(bytes, kMagic, 1, bytes.size(), "model.bin"));
}

TEST(SealedFile, SealingRefusesAnEmptyMagicAndVersionZero) {
  EXPECT_EQ(ErrorFrom([] { SealFile("", 1, "x"); }).field(), "magic");
  EXPECT_EQ(ErrorFrom([] { SealFile(kMagic, 0, "x"); }).field(), "format_version");
}

}  // namespace
}  // namespace nucleate::model
