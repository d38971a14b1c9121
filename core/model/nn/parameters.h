// Every trainable number of a network lives in one flat array, described by a layout of named
// tensors. The optimiser, the moving average, gradient sums and the bundle work on the flat array;
// layers see matrix views of their own tensors.
#pragma once

#include <cstddef>
#include <cstdint>
#include <string>
#include <vector>

#include "core/model/nn/tensor.h"

namespace nucleate::model::nn {

struct TensorSpec {
  std::string name;    // unique, e.g. "layer2.edge_out.weight"
  int rows = 0;
  int cols = 0;
  std::size_t offset = 0;  // first element in the flat array
  // How Initialise fills it: kNormal draws N(0, init_scale^2), kZero and kOne are constants.
  enum class Init { kNormal, kZero, kOne } init = Init::kNormal;
  double init_scale = 0;
  std::size_t size() const { return static_cast<std::size_t>(rows) * cols; }
};

class ParameterLayout {
 public:
  // Appends a tensor; returns its index. InvalidArgument for a repeated name or a non-positive
  // shape.
  int Add(const std::string& name, int rows, int cols, TensorSpec::Init init, double init_scale);

  const std::vector<TensorSpec>& tensors() const { return tensors_; }
  const TensorSpec& tensor(int index) const { return tensors_[index]; }
  // -1 when absent.
  int Find(const std::string& name) const;
  std::size_t size() const { return size_; }  // total number of values

 private:
  std::vector<TensorSpec> tensors_;
  std::size_t size_ = 0;
};

// Views of tensor `index` inside a flat array laid out by `layout`.
template <typename T>
MatrixMap<T> View(const ParameterLayout& layout, int index, T* values) {
  const TensorSpec& s = layout.tensor(index);
  return MatrixMap<T>(values + s.offset, s.rows, s.cols);
}
template <typename T>
ConstMatrixMap<T> View(const ParameterLayout& layout, int index, const T* values) {
  const TensorSpec& s = layout.tensor(index);
  return ConstMatrixMap<T>(values + s.offset, s.rows, s.cols);
}

// Fresh values for `layout`, deterministic for `seed`: tensor k draws from the Philox stream of
// item index 2^32 - 1 - k (core/model/DESIGN.md, "Randomness"), so adding a tensor at the end
// never changes the others.
template <typename T>
std::vector<T> Initialise(const ParameterLayout& layout, std::uint32_t seed);

}  // namespace nucleate::model::nn
