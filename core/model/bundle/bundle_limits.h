// Sizes a bundle file may have, checked before anything of that size is allocated. A caller may
// raise them up to the ceilings.
#pragma once

#include <cstdint>

#include "core/model/architecture.h"
#include "core/schedule/limits.h"

namespace nucleate::model {

struct BundleLimits {
  static constexpr std::uint64_t kDefaultMaxFileBytes = std::uint64_t{512} << 20;  // 512 MiB
  // Protocol buffers parse at most 2 GiB - 1 bytes in one message.
  static constexpr std::uint64_t kCeilingMaxFileBytes = (std::uint64_t{1} << 31) - 1;

  std::uint64_t max_file_bytes = kDefaultMaxFileBytes;
  // Float32 values over all tensors; the default is 512 MiB of floats, the file size limit.
  std::uint64_t max_tensor_values = std::uint64_t{1} << 27;
  std::uint64_t max_tensors = 4096;
  // Longest atom-count histogram: the largest cell the training set may have held.
  std::uint64_t max_histogram_atoms = 100000;
  ArchitectureLimits architecture;
  schedule::ScheduleLimits schedule;
};

// InvalidArgument naming the limit ("max_file_bytes", ...) for a zero or above its ceiling.
void ValidateBundleLimits(const BundleLimits& limits);

}  // namespace nucleate::model
