// Central finite differences against a layer's hand-written backward pass, in double. A layer is
// described by two closures over its parameters and input; the check takes the loss
// L = sum(dy .* y) with a random upstream gradient dy, so dL/dy = dy and the backward pass must
// return dL/dparams and dL/dx.
#pragma once

#include <cstdint>
#include <functional>
#include <vector>

#include "core/model/nn/tensor.h"

namespace nucleate::model::nn::testing {

using Params = std::vector<double>;
using Mat = Matrix<double>;

// Entries N(0, 1) from a fixed random stream, so every run sees the same numbers.
Mat RandomMatrix(int rows, int cols, std::uint32_t item);
Params RandomValues(std::size_t count, std::uint32_t item);

struct LayerUnderTest {
  Params params;  // may be empty
  Mat input;      // may be empty when the layer's input is not differentiable (ids)
  std::function<Mat(const Params& params, const Mat& x)> forward;
  // Accumulates dL/dparams into grads (laid out like params) and overwrites *dx (may be null).
  std::function<void(const Params& params, const Mat& x, const Mat& dy, double* grads, Mat* dx)>
      backward;
};

// What the check measured, for the test's own expectations.
struct GradientReport {
  double worst_relative_error = 0;  // over entries with a gradient
  int entries_with_gradient = 0;
  int entries_without_gradient = 0;  // analytic and numeric both below kNoGradient
};

// Below this, on both sides, an entry counts as having no gradient (e.g. an embedding row no id
// selects): the finite-difference noise is about 1e-10 here.
constexpr double kNoGradient = 1e-9;
constexpr double kRelativeTolerance = 1e-6;

// Runs every check below with gtest expectations and returns the measured errors:
//  * each parameter and input gradient against central differences (relative error < 1e-6);
//  * parameter gradients accumulate: backward into grads holding G0 gives G0 + the gradient;
//  * dx is overwritten: a dx holding values of another shape ends up equal to a fresh one;
//  * dx may be null, with the same parameter gradients.
GradientReport CheckLayerGradients(const LayerUnderTest& layer, std::uint32_t seed);

}  // namespace nucleate::model::nn::testing
