#include "core/model/bundle/bundle_limits.h"

#include <string>

#include "core/common/error.h"

namespace nucleate::model {

void ValidateBundleLimits(const BundleLimits& limits) {
  if (limits.max_file_bytes == 0 || limits.max_file_bytes > BundleLimits::kCeilingMaxFileBytes) {
    throw InvalidArgument("max_file_bytes", "is " + std::to_string(limits.max_file_bytes) +
                                                ", must be in 1.." +
                                                std::to_string(BundleLimits::kCeilingMaxFileBytes));
  }
  if (limits.max_tensor_values == 0) throw InvalidArgument("max_tensor_values", "must be >= 1");
  if (limits.max_tensors == 0) throw InvalidArgument("max_tensors", "must be >= 1");
  if (limits.max_histogram_atoms == 0) {
    throw InvalidArgument("max_histogram_atoms", "must be >= 1");
  }
}

}  // namespace nucleate::model
