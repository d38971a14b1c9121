// Linear, SiLU, LayerNorm and Embedding: layouts and backward passes against central finite
// differences (the definition of the derivative; no other source needed).
#include <gtest/gtest.h>

#include <cmath>

#include "core/model/nn/layers.h"
#include "tests/unit/nn/gradient_check.h"

namespace nucleate::model::nn {
namespace {

using testing::CheckLayerGradients;
using testing::GradientReport;
using testing::LayerUnderTest;
using testing::Mat;
using testing::Params;
using testing::RandomMatrix;
using testing::RandomValues;

TEST(AddLayers, LayoutNamesShapesAndInitialisation) {
  ParameterLayout layout;
  const Linear linear = AddLinear(&layout, "fc", 16, 3);
  const LayerNorm norm = AddLayerNorm(&layout, "norm", 3);
  const Embedding table = AddEmbedding(&layout, "species", 5, 3);

  const TensorSpec& weight = layout.tensor(linear.weight);
  EXPECT_EQ(weight.name, "fc.weight");
  EXPECT_EQ(weight.rows, 16);
  EXPECT_EQ(weight.cols, 3);
  EXPECT_EQ(weight.init, TensorSpec::Init::kNormal);
  EXPECT_DOUBLE_EQ(weight.init_scale, 0.25);  // 1 / sqrt(16)
  EXPECT_EQ(layout.tensor(linear.bias).init, TensorSpec::Init::kZero);
  EXPECT_EQ(layout.tensor(norm.gain).init, TensorSpec::Init::kOne);
  EXPECT_EQ(layout.tensor(norm.shift).init, TensorSpec::Init::kZero);
  EXPECT_EQ(layout.tensor(table.table).init, TensorSpec::Init::kNormal);
  EXPECT_EQ(layout.tensor(table.table).init_scale, 1.0);
  // The offsets the passes use are the layout's.
  EXPECT_EQ(linear.bias_offset, layout.tensor(linear.bias).offset);
  EXPECT_EQ(norm.shift_offset, layout.tensor(norm.shift).offset);
  EXPECT_EQ(table.table_offset, layout.tensor(table.table).offset);
  EXPECT_EQ(layout.size(), 16u * 3 + 3 + 3 + 3 + 5 * 3);
}

LayerUnderTest LinearCase(int rows, int in, int out) {
  ParameterLayout layout;
  const Linear l = AddLinear(&layout, "fc", in, out);
  LayerUnderTest t;
  t.params = RandomValues(layout.size(), 10);  // a non-zero bias too
  t.input = RandomMatrix(rows, in, 11);
  t.forward = [l](const Params& p, const Mat& x) {
    Mat y;
    LinearForward(l, p.data(), x, &y);
    return y;
  };
  t.backward = [l](const Params& p, const Mat& x, const Mat& dy, double* g, Mat* dx) {
    LinearBackward(l, p.data(), x, dy, g, dx);
  };
  return t;
}

TEST(LinearGradient, MatchesFiniteDifferences) {
  const GradientReport r = CheckLayerGradients(LinearCase(5, 4, 3), 1);
  EXPECT_EQ(r.entries_with_gradient, 4 * 3 + 3 + 5 * 4);
}

TEST(LinearGradient, OneRow) {
  const GradientReport r = CheckLayerGradients(LinearCase(1, 3, 2), 2);
  EXPECT_EQ(r.entries_with_gradient, 3 * 2 + 2 + 3);
}

TEST(LinearForward, IsXWPlusB) {
  // y = x W + b checked entry by entry on a 1 x 2 by 2 x 2 case worked by hand.
  ParameterLayout layout;
  const Linear l = AddLinear(&layout, "fc", 2, 2);
  Params p(layout.size());
  // W = [[1, 2], [3, 4]], b = [10, 20].
  p[layout.tensor(l.weight).offset + 0] = 1;
  p[layout.tensor(l.weight).offset + 1] = 2;
  p[layout.tensor(l.weight).offset + 2] = 3;
  p[layout.tensor(l.weight).offset + 3] = 4;
  p[layout.tensor(l.bias).offset + 0] = 10;
  p[layout.tensor(l.bias).offset + 1] = 20;
  Mat x(1, 2);
  x << 5, 6;
  Mat y;
  LinearForward(l, p.data(), x, &y);
  // [5, 6] W = [5 + 18, 10 + 24] = [23, 34]; plus b.
  EXPECT_EQ(y(0, 0), 33);
  EXPECT_EQ(y(0, 1), 54);
}

TEST(SiluGradient, MatchesFiniteDifferences) {
  LayerUnderTest t;
  t.input = 3 * RandomMatrix(4, 6, 12);  // wide enough to reach both tails of the sigmoid
  t.forward = [](const Params&, const Mat& x) {
    Mat y;
    SiluForward(x, &y);
    return y;
  };
  t.backward = [](const Params&, const Mat& x, const Mat& dy, double*, Mat* dx) {
    if (dx != nullptr) SiluBackward(x, dy, dx);
  };
  const GradientReport r = CheckLayerGradients(t, 3);
  EXPECT_EQ(r.entries_with_gradient, 24);
}

TEST(SiluForward, ValuesAndTails) {
  Mat x(1, 4);
  x << 0.0, 1.0, -800.0, 800.0;
  Mat y;
  SiluForward(x, &y);
  EXPECT_EQ(y(0, 0), 0.0);
  EXPECT_DOUBLE_EQ(y(0, 1), 1.0 / (1.0 + std::exp(-1.0)));
  EXPECT_EQ(y(0, 2), 0.0);  // e^800 overflows: the result is -0, not NaN
  EXPECT_EQ(y(0, 3), 800.0);
}

LayerUnderTest LayerNormCase(int rows, int width, double input_scale) {
  ParameterLayout layout;
  const LayerNorm l = AddLayerNorm(&layout, "norm", width);
  LayerUnderTest t;
  t.params = RandomValues(layout.size(), 13);  // gains and shifts away from 1 and 0
  t.input = input_scale * RandomMatrix(rows, width, 14);
  t.forward = [l](const Params& p, const Mat& x) {
    Mat y;
    LayerNormCache<double> cache;
    LayerNormForward(l, p.data(), x, &y, &cache);
    return y;
  };
  t.backward = [l](const Params& p, const Mat& x, const Mat& dy, double* g, Mat* dx) {
    Mat y;
    LayerNormCache<double> cache;
    LayerNormForward(l, p.data(), x, &y, &cache);
    LayerNormBackward(l, p.data(), cache, dy, g, dx);
  };
  return t;
}

TEST(LayerNormGradient, MatchesFiniteDifferences) {
  const GradientReport r = CheckLayerGradients(LayerNormCase(6, 5, 2.0), 4);
  EXPECT_EQ(r.entries_with_gradient, 5 + 5 + 6 * 5);
}

TEST(LayerNormGradient, OneRow) {
  const GradientReport r = CheckLayerGradients(LayerNormCase(1, 7, 1.0), 5);
  EXPECT_EQ(r.entries_with_gradient, 7 + 7 + 7);
}

TEST(LayerNormForward, RowsHaveZeroMeanAndUnitVarianceBeforeGain) {
  // With gain 1 and shift 0, each row has mean 0 and variance var / (var + 1e-5).
  ParameterLayout layout;
  const LayerNorm l = AddLayerNorm(&layout, "norm", 4);
  const Params p = {1, 1, 1, 1, 0, 0, 0, 0};
  Mat x(1, 4);
  x << 1, 2, 3, 4;  // mean 2.5, population variance 1.25
  Mat y;
  LayerNormCache<double> cache;
  LayerNormForward(l, p.data(), x, &y, &cache);
  EXPECT_NEAR(y.sum(), 0.0, 1e-15);
  EXPECT_NEAR(y.squaredNorm() / 4, 1.25 / (1.25 + 1e-5), 1e-15);
  EXPECT_DOUBLE_EQ(cache.inverse_std[0], 1.0 / std::sqrt(1.25 + 1e-5));
}

TEST(EmbeddingGradient, MatchesFiniteDifferencesWithRepeatedAndUnusedIds) {
  ParameterLayout layout;
  const Embedding e = AddEmbedding(&layout, "species", 5, 3);
  const std::vector<int> ids = {2, 0, 2, 4, 2};  // row 2 thrice, rows 1 and 3 never
  LayerUnderTest t;
  t.params = RandomValues(layout.size(), 15);
  t.forward = [e, ids](const Params& p, const Mat&) {
    Mat y;
    EmbeddingForward(e, p.data(), ids, &y);
    return y;
  };
  t.backward = [e, ids](const Params&, const Mat&, const Mat& dy, double* g, Mat*) {
    EmbeddingBackward(e, ids, dy, g);
  };
  const GradientReport r = CheckLayerGradients(t, 6);
  EXPECT_EQ(r.entries_with_gradient, 3 * 3);
  EXPECT_EQ(r.entries_without_gradient, 2 * 3);
}

}  // namespace
}  // namespace nucleate::model::nn
