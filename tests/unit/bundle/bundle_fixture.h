// A small, valid bundle for the bundle tests, and helpers to catch and look at errors.
#pragma once

#include <functional>
#include <string>

#include "core/common/error.h"
#include "core/model/bundle/model_bundle.h"

namespace nucleate::model::testing {

// Absorbing species mode, one property, three tensors whose values include -0, a subnormal, the
// largest float and values with all mantissa bits set, so a round trip that is not bit-exact shows.
ModelBundle SmallBundle();

// The error `action` throws; a test failure (and an Internal error) when it throws nothing.
Error ErrorFrom(const std::function<void()>& action);

// A fresh empty directory under the system's temporary directory, removed by the destructor.
class TemporaryDirectory {
 public:
  TemporaryDirectory();
  ~TemporaryDirectory();
  TemporaryDirectory(const TemporaryDirectory&) = delete;
  TemporaryDirectory& operator=(const TemporaryDirectory&) = delete;
  const std::string& path() const { return path_; }
  std::string File(const std::string& name) const { return path_ + "/" + name; }

 private:
  std::string path_;
};

}  // namespace nucleate::model::testing
