#include "core/random/random_stream.h"

#include <Random123/philox.h>

#include <cmath>
#include <limits>

#include "core/common/error.h"

namespace nucleate::random {
namespace {

using Philox = r123::Philox4x32_R<10>;

constexpr double kTwoPi = 6.28318530717958647692;
constexpr double kTwoToMinus53 = 1.0 / 9007199254740992.0;  // 2^-53

}  // namespace

RandomStream::RandomStream(std::uint32_t seed, std::uint32_t item, std::uint32_t step,
                           Purpose purpose)
    : key_{seed, item}, counter_{0, step, static_cast<std::uint32_t>(purpose), 0} {}

void RandomStream::Refill() {
  // Wrapping the 32-bit draw counter would replay the stream from its start; 2^32 blocks (64 GiB
  // of random bits) is far beyond any one cell's or sample's needs, so reaching it is an error.
  if (counter_[0] == std::numeric_limits<std::uint32_t>::max()) {
    throw LimitExceeded("random_stream", "more than 2^32 - 1 Philox blocks drawn from one stream");
  }
  const Philox::ctr_type counter = {{counter_[0], counter_[1], counter_[2], counter_[3]}};
  const Philox::key_type key = {{key_[0], key_[1]}};
  const Philox::ctr_type out = Philox()(counter, key);
  for (int i = 0; i < 4; ++i) block_[i] = out.v[i];
  ++counter_[0];
  used_ = 0;
}

std::uint32_t RandomStream::NextWord() {
  if (used_ == 4) Refill();
  return block_[used_++];
}

double RandomStream::Uniform() {
  // The top 53 of 64 bits: every double in [0, 1) on the 2^-53 grid is equally likely.
  const std::uint64_t high = NextWord();
  const std::uint64_t low = NextWord();
  return static_cast<double>(((high << 32) | low) >> 11) * kTwoToMinus53;
}

double RandomStream::UniformOpenZero() {
  // 1 - u maps the grid {0, ..., 1 - 2^-53} onto {2^-53, ..., 1} exactly.
  return 1.0 - Uniform();
}

double RandomStream::Normal() {
  if (has_spare_normal_) {
    has_spare_normal_ = false;
    return spare_normal_;
  }
  // Box and Muller 1958: two independent uniforms give two independent standard normals. The
  // radius takes the (0, 1] uniform so its logarithm is finite.
  const double radius = std::sqrt(-2.0 * std::log(UniformOpenZero()));
  const double angle = kTwoPi * Uniform();
  spare_normal_ = radius * std::sin(angle);
  has_spare_normal_ = true;
  return radius * std::cos(angle);
}

std::uint32_t RandomStream::Below(std::uint32_t n) {
  if (n == 0) throw InvalidArgument("n", "must be > 0");
  // Words below 2^32 mod n are rejected, so the accepted range holds a whole number of copies of
  // [0, n) and the remainder is exactly uniform.
  const std::uint32_t rejected_below = (0u - n) % n;
  for (;;) {
    const std::uint32_t word = NextWord();
    if (word >= rejected_below) return word % n;
  }
}

}  // namespace nucleate::random
