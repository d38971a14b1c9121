// AdamW, gradient clipping, the learning-rate schedule and the moving average
// (core/train/optim/optimizer.h).
#include "core/train/optim/optimizer.h"

#include <gtest/gtest.h>

#include <cmath>

#include "core/common/error.h"

namespace nucleate::train {
namespace {

TEST(AdamW, TwoStepsWorkedByHand) {
  // Loshchilov and Hutter 2019, Algorithm 2, by hand, with beta1 = 0.9, beta2 = 0.999,
  // epsilon = 1e-8, lr = 0.1, weight decay 0.01 (scaled by lr, as the header says).
  // Parameter 0 starts at 1 with gradients 0.5 then -0.25:
  //   t = 1: m = 0.1 * 0.5 = 0.05;  v = 0.001 * 0.25 = 0.00025
  //          m^ = 0.05 / 0.1 = 0.5;  v^ = 0.00025 / 0.001 = 0.25;  sqrt(v^) = 0.5
  //          w = 1 - 0.1 * (0.5 / (0.5 + 1e-8) + 0.01 * 1) = 1 - 0.1 * 1.00999998 = 0.899000002
  //   t = 2: m = 0.9 * 0.05 + 0.1 * (-0.25) = 0.02
  //          v = 0.999 * 0.00025 + 0.001 * 0.0625 = 0.00031225
  //          m^ = 0.02 / (1 - 0.81) = 0.105263157894737
  //          v^ = 0.00031225 / (1 - 0.998001) = 0.156203101550775;  sqrt = 0.395225380701667
  //          m^ / (sqrt(v^) + 1e-8) = 0.266337032921536
  //          w = 0.899000002 - 0.1 * (0.266337032921536 + 0.01 * 0.899000002)
  //            = 0.899000002 - 0.0275327032941536 = 0.871467298705846
  // Parameter 1 starts at 2 with zero gradients: the moments stay 0 and only the decoupled decay
  // acts, w = 2 * (1 - 0.001) = 1.998, then 1.998 * 0.999 = 1.996002.
  AdamWSettings settings;
  settings.beta1 = 0.9;
  settings.beta2 = 0.999;
  settings.epsilon = 1e-8;
  settings.weight_decay = 0.01;
  std::vector<float> params = {1.0f, 2.0f};
  AdamWState state;
  AdamWStep(settings, 0.1, {0.5f, 0.0f}, &params, &state);
  EXPECT_EQ(state.step, 1);
  // Values are kept in float: about 6e-8 relative per rounding, so 2e-7 leaves a few roundings.
  EXPECT_NEAR(params[0], 0.899000002, 2e-7);
  EXPECT_NEAR(params[1], 1.998, 2e-7);
  EXPECT_NEAR(state.first[0], 0.05, 0.05 * 1e-7);
  EXPECT_NEAR(state.second[0], 0.00025, 0.00025 * 1e-7);

  AdamWStep(settings, 0.1, {-0.25f, 0.0f}, &params, &state);
  EXPECT_EQ(state.step, 2);
  EXPECT_NEAR(params[0], 0.871467298705846, 2e-7);
  EXPECT_NEAR(params[1], 1.996002, 2e-7);
  EXPECT_NEAR(state.first[0], 0.02, 0.02 * 2e-7);
  EXPECT_NEAR(state.second[0], 0.00031225, 0.00031225 * 2e-7);
  EXPECT_EQ(state.first[1], 0.0f);
  EXPECT_EQ(state.second[1], 0.0f);
}

TEST(AdamW, MinimisesAQuadratic) {
  // f(w) = 1/2 sum_i a_i (w_i - c_i)^2 with curvatures over three decades; the minimum is w = c.
  const std::vector<double> curvature = {0.01, 1.0, 10.0};
  const std::vector<double> centre = {1.5, -2.0, 0.25};
  std::vector<float> w = {0.0f, 0.0f, 0.0f};
  AdamWSettings settings;  // defaults, no weight decay, so the minimum does not move
  AdamWState state;
  const int steps = 3000;
  for (int step = 0; step < steps; ++step) {
    std::vector<float> grads(3);
    for (int i = 0; i < 3; ++i) grads[i] = static_cast<float>(curvature[i] * (w[i] - centre[i]));
    AdamWStep(settings, LearningRateAt(step, 0.05, 100, steps, 0.01), grads, &w, &state);
  }
  for (int i = 0; i < 3; ++i) EXPECT_NEAR(w[i], centre[i], 1e-3) << i;
}

TEST(AdamW, RefusesMismatchedSizesAndBadSettings) {
  std::vector<float> params = {1, 2};
  AdamWState state;
  try {
    AdamWStep(AdamWSettings{}, 0.1, {1.0f}, &params, &state);
    FAIL() << "a short gradient was accepted";
  } catch (const Error& e) {
    EXPECT_EQ(e.field(), "grads");
  }
  AdamWSettings bad;
  bad.beta2 = 1.0;  // 1 - beta2^t = 0: the bias correction divides by zero
  try {
    AdamWStep(bad, 0.1, {1.0f, 1.0f}, &params, &state);
    FAIL() << "beta2 = 1 was accepted";
  } catch (const Error& e) {
    EXPECT_EQ(e.field(), "beta2");
  }
  EXPECT_EQ(params, (std::vector<float>{1, 2}));
  EXPECT_EQ(state.step, 0);
}

TEST(LearningRate, WarmUpIsLinear) {
  // Warm-up over 10 steps (Goyal et al. 2017, linear scaling with gradual warm-up): step k runs
  // at (k + 1) / 10 of the peak.
  EXPECT_DOUBLE_EQ(LearningRateAt(0, 1e-3, 10, 110, 0.1), 1e-4);
  EXPECT_DOUBLE_EQ(LearningRateAt(4, 1e-3, 10, 110, 0.1), 5e-4);
  EXPECT_DOUBLE_EQ(LearningRateAt(9, 1e-3, 10, 110, 0.1), 1e-3);
}

TEST(LearningRate, CosineDecayAtChosenAngles) {
  // Loshchilov and Hutter 2017 (SGDR), eq. 5: lr = min + (peak - min) (1 + cos(pi p)) / 2 with
  // p the fraction of the 90 decay steps done, min = 0.1 peak. At p = 0, 1/3, 1/2, 2/3, 1 the
  // cosine is 1, 1/2, 0, -1/2, -1, so lr / peak = 1, 0.775, 0.55, 0.325, 0.1.
  const double peak = 2e-3;
  EXPECT_DOUBLE_EQ(LearningRateAt(10, peak, 10, 100, 0.1), peak);
  EXPECT_NEAR(LearningRateAt(40, peak, 10, 100, 0.1), 0.775 * peak, 1e-15);
  EXPECT_NEAR(LearningRateAt(55, peak, 10, 100, 0.1), 0.55 * peak, 1e-15);
  EXPECT_NEAR(LearningRateAt(70, peak, 10, 100, 0.1), 0.325 * peak, 1e-15);
  EXPECT_NEAR(LearningRateAt(100, peak, 10, 100, 0.1), 0.1 * peak, 1e-15);
  EXPECT_NEAR(LearningRateAt(5000, peak, 10, 100, 0.1), 0.1 * peak, 1e-15);  // held
}

TEST(LearningRate, NoWarmUpStartsAtThePeak) {
  EXPECT_DOUBLE_EQ(LearningRateAt(0, 1.0, 0, 4, 0.0), 1.0);
  // p = 1/4: (1 + cos(pi / 4)) / 2 = (1 + sqrt(2) / 2) / 2.
  EXPECT_NEAR(LearningRateAt(1, 1.0, 0, 4, 0.0), (1 + std::sqrt(2.0) / 2) / 2, 1e-15);
  EXPECT_THROW(LearningRateAt(0, 1.0, 10, 5, 0.0), Error);  // decay would end before warm-up
  EXPECT_THROW(LearningRateAt(-1, 1.0, 0, 5, 0.0), Error);
}

TEST(ClipGradientNorm, ThreeFourFiveToUnitNorm) {
  // |(3, 4)| = 5 (the 3-4-5 right triangle); scaled to norm 1 it is (0.6, 0.8).
  std::vector<float> g = {3.0f, 4.0f};
  EXPECT_EQ(ClipGradientNorm(&g, 1.0), 5.0);
  EXPECT_NEAR(g[0], 0.6f, 1e-7);
  EXPECT_NEAR(g[1], 0.8f, 1e-7);
}

TEST(ClipGradientNorm, LeavesSmallGradientsAndDisabledClippingAlone) {
  std::vector<float> g = {3.0f, 4.0f};
  EXPECT_EQ(ClipGradientNorm(&g, 10.0), 5.0);
  EXPECT_EQ(g, (std::vector<float>{3.0f, 4.0f}));
  EXPECT_EQ(ClipGradientNorm(&g, 0.0), 5.0);
  EXPECT_EQ(g, (std::vector<float>{3.0f, 4.0f}));
}

TEST(ClipGradientNorm, NonFiniteGradientIsANumericalError) {
  std::vector<float> g = {1.0f, std::nanf(""), 2.0f};
  try {
    ClipGradientNorm(&g, 1.0);
    FAIL() << "a NaN gradient was accepted";
  } catch (const Error& e) {
    EXPECT_EQ(e.kind(), ErrorKind::kNumerical);
    EXPECT_EQ(e.field(), "gradient");
  }
  std::vector<float> h = {1.0f, INFINITY};
  EXPECT_THROW(ClipGradientNorm(&h, 0.0), Error);
}

TEST(ClipGradientNorm, LargeFloatsDoNotOverflowTheNorm) {
  // 3e38 squared overflows float but not double: the norm is 3e38 * sqrt(2).
  std::vector<float> g = {3e38f, 3e38f};
  const double norm = ClipGradientNorm(&g, 1.0);
  EXPECT_NEAR(norm / (static_cast<double>(3e38f) * std::sqrt(2.0)), 1.0, 1e-15);
  EXPECT_NEAR(g[0], std::sqrt(0.5), 1e-7);
}

TEST(MovingAverage, OneUpdateWorkedByHand) {
  // 0.9 * 1 + 0.1 * 2 = 1.1; 0.9 * -4 + 0.1 * 6 = -3.
  std::vector<float> ema = {1.0f, -4.0f};
  UpdateMovingAverage(0.9, {2.0f, 6.0f}, &ema);
  EXPECT_NEAR(ema[0], 1.1f, 1e-7);
  EXPECT_NEAR(ema[1], -3.0f, 1e-7);
  std::vector<float> short_ema = {1.0f};
  EXPECT_THROW(UpdateMovingAverage(0.9, {2.0f, 6.0f}, &short_ema), Error);
}

}  // namespace
}  // namespace nucleate::train
