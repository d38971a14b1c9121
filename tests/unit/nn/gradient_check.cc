#include "tests/unit/nn/gradient_check.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <sstream>

#include "core/random/random_stream.h"

namespace nucleate::model::nn::testing {
namespace {

constexpr std::uint32_t kTestSeed = 20240601;
// Central differences have truncation error ~ h^2 f''' / 6 and rounding error ~ 1e-16 |L| / h;
// with |L| ~ 10 and smooth layers h = 1e-5 keeps both near 1e-10.
constexpr double kStep = 1e-5;

std::vector<double> NumericGradient(const std::function<double()>& loss, double* values,
                                    std::size_t count) {
  std::vector<double> gradient(count);
  for (std::size_t i = 0; i < count; ++i) {
    const double saved = values[i];
    values[i] = saved + kStep;
    const double above = loss();
    values[i] = saved - kStep;
    const double below = loss();
    values[i] = saved;
    gradient[i] = (above - below) / (2 * kStep);
  }
  return gradient;
}

void Compare(const char* what, const double* analytic, const std::vector<double>& numeric,
             GradientReport* report) {
  for (std::size_t i = 0; i < numeric.size(); ++i) {
    const double scale = std::max(std::fabs(analytic[i]), std::fabs(numeric[i]));
    if (scale < kNoGradient) {
      ++report->entries_without_gradient;
      continue;
    }
    const double relative = std::fabs(analytic[i] - numeric[i]) / scale;
    ++report->entries_with_gradient;
    report->worst_relative_error = std::max(report->worst_relative_error, relative);
    EXPECT_LT(relative, kRelativeTolerance)
        << what << " entry " << i << ": analytic " << analytic[i] << ", numeric " << numeric[i];
  }
}

}  // namespace

Mat RandomMatrix(int rows, int cols, std::uint32_t item) {
  random::RandomStream stream(kTestSeed, item, 0, random::Purpose::kInitialise);
  Mat m(rows, cols);
  for (Eigen::Index i = 0; i < m.size(); ++i) m.data()[i] = stream.Normal();
  return m;
}

Params RandomValues(std::size_t count, std::uint32_t item) {
  random::RandomStream stream(kTestSeed, item, 1, random::Purpose::kInitialise);
  Params values(count);
  for (double& v : values) v = stream.Normal();
  return values;
}

GradientReport CheckLayerGradients(const LayerUnderTest& layer, std::uint32_t seed) {
  Params params = layer.params;
  Mat x = layer.input;
  const Mat y = layer.forward(params, x);
  const Mat dy = RandomMatrix(static_cast<int>(y.rows()), static_cast<int>(y.cols()), seed);
  const auto loss = [&] { return (dy.array() * layer.forward(params, x).array()).sum(); };

  Params grads(params.size(), 0.0);
  Mat dx = Mat::Constant(3, 2, 42.0);  // another shape: the pass must resize and overwrite it
  layer.backward(params, x, dy, grads.data(), &dx);

  GradientReport report;
  Compare("parameter", grads.data(), NumericGradient(loss, params.data(), params.size()),
          &report);
  if (x.size() > 0) {
    EXPECT_EQ(dx.rows(), x.rows());
    EXPECT_EQ(dx.cols(), x.cols());
    if (dx.rows() == x.rows() && dx.cols() == x.cols()) {
      Compare("input", dx.data(), NumericGradient(loss, x.data(), x.size()), &report);
    }
  }

  // Parameter gradients add to what is there; dx replaces what is there.
  const Params start = RandomValues(params.size(), seed + 1);
  Params accumulated = start;
  Mat dx_again = Mat::Constant(x.rows() + 1, x.cols() + 2, -7.0);
  layer.backward(params, x, dy, accumulated.data(), &dx_again);
  for (std::size_t i = 0; i < params.size(); ++i) {
    EXPECT_NEAR(accumulated[i] - start[i], grads[i], 1e-12 * (1 + std::fabs(grads[i])))
        << "parameter " << i << " did not accumulate";
  }
  if (x.size() > 0) {
    const bool same_shape = dx_again.rows() == dx.rows() && dx_again.cols() == dx.cols();
    EXPECT_TRUE(same_shape) << "dx was not resized";
    if (same_shape) {
      EXPECT_TRUE(dx_again == dx) << "dx was not overwritten";
    }
  }

  Params without_dx(params.size(), 0.0);
  layer.backward(params, x, dy, without_dx.data(), nullptr);
  EXPECT_EQ(without_dx, grads) << "a null dx changed the parameter gradients";
  // Kept in the test report (--gtest_output=xml) so the margin below the tolerance is on record.
  std::ostringstream worst;
  worst << report.worst_relative_error;
  ::testing::Test::RecordProperty("worst_relative_error", worst.str());
  return report;
}

}  // namespace nucleate::model::nn::testing
