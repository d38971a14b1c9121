#include "core/common/sha256.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <cstdint>
#include <string>
#include <vector>

namespace nucleate {
namespace {

std::string HexOf(const std::string& message) { return ToHex(Sha256(message)); }

// The 448-bit two-block message of FIPS 180-2 Appendix B.2.
const char kTwoBlockMessage[] = "abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq";

// Digests below: from memory; each agrees with /usr/bin/python3 hashlib.sha256 (checked when the
// test was written, and for random messages by tests/reference/sha256).

TEST(Sha256, OneBlockMessageAbcFips180_2AppendixB1) {
  EXPECT_EQ(HexOf("abc"), "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
}

TEST(Sha256, TwoBlockMessageFips180_2AppendixB2) {
  ASSERT_EQ(std::string(kTwoBlockMessage).size() * 8, 448u);
  EXPECT_EQ(HexOf(kTwoBlockMessage),
            "248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1");
}

TEST(Sha256, OneMillionLetterAFips180_2AppendixB3) {
  EXPECT_EQ(HexOf(std::string(1000000, 'a')),
            "cdc76e5c9914fb9281a1c7e284d73e67f1809a48a497200e046d39ccc7112cd0");
}

// The empty message: NIST CAVP SHA256ShortMsg, Len = 0 (from memory).
TEST(Sha256, EmptyMessageNistCavpShortMsgLen0) {
  EXPECT_EQ(HexOf(""), "e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855");
  Sha256Hasher hasher;
  hasher.Update(nullptr, 0);
  EXPECT_EQ(ToHex(hasher.Finish()), HexOf(""));
}

// A message whose bytes are not all ASCII, long enough for several blocks and a ragged tail.
std::string MixedMessage(std::size_t size) {
  std::string message(size, '\0');
  std::uint32_t x = 12345;
  for (char& c : message) {
    x = x * 1664525u + 1013904223u;  // Numerical Recipes LCG: any byte source would do
    c = static_cast<char>(x >> 24);
  }
  return message;
}

TEST(Sha256, EverySplitIntoTwoUpdatesEqualsOneShot) {
  const std::string message = MixedMessage(300);
  const Sha256Digest one_shot = Sha256(message);
  for (std::size_t split = 0; split <= message.size(); ++split) {
    Sha256Hasher hasher;
    hasher.Update(message.data(), split);
    hasher.Update(message.data() + split, message.size() - split);
    EXPECT_EQ(hasher.Finish(), one_shot) << "split at " << split;
  }
}

TEST(Sha256, EveryChunkSizeEqualsOneShot) {
  const std::string message = MixedMessage(1000);
  const Sha256Digest one_shot = Sha256(message);
  for (std::size_t chunk = 1; chunk <= 130; ++chunk) {
    Sha256Hasher hasher;
    for (std::size_t at = 0; at < message.size(); at += chunk) {
      hasher.Update(message.substr(at, chunk));
    }
    EXPECT_EQ(hasher.Finish(), one_shot) << "chunk " << chunk;
  }
}

TEST(Sha256, MillionAInUnevenChunksMatchesAppendixB3) {
  Sha256Hasher hasher;
  std::size_t done = 0;
  for (std::size_t chunk = 1; done < 1000000; chunk = chunk % 97 + 1) {
    const std::size_t n = std::min(chunk, 1000000 - done);
    hasher.Update(std::string(n, 'a'));
    done += n;
  }
  EXPECT_EQ(ToHex(hasher.Finish()),
            "cdc76e5c9914fb9281a1c7e284d73e67f1809a48a497200e046d39ccc7112cd0");
}

// Lengths 55, 56 and 64 bytes put the 64-bit length field at the edge of a block (FIPS 180-4
// section 5.1.1): one length more or less changes the padding from one block to two.
TEST(Sha256, PaddingBoundariesDifferFromEachOther) {
  std::vector<std::string> digests;
  for (std::size_t n : {55, 56, 57, 63, 64, 65}) digests.push_back(HexOf(std::string(n, 'a')));
  for (std::size_t i = 0; i < digests.size(); ++i) {
    for (std::size_t j = i + 1; j < digests.size(); ++j) EXPECT_NE(digests[i], digests[j]);
  }
  // 'a' repeated 64 times; from memory, agrees with python3 hashlib.
  EXPECT_EQ(digests[4], "ffe054fe7ae0cb6dc65c3af9b61d5209f439851db43d0ba5997337df154668eb");
}

TEST(Sha256, HexIsLowercaseAndTwoDigitsPerByte) {
  Sha256Digest digest{};
  digest[0] = 0x0f;
  digest[31] = 0xa0;
  const std::string hex = ToHex(digest);
  ASSERT_EQ(hex.size(), 64u);
  EXPECT_EQ(hex.substr(0, 2), "0f");
  EXPECT_EQ(hex.substr(62, 2), "a0");
}

}  // namespace
}  // namespace nucleate
