// A chain of layers as the denoiser strings them (per-atom Linear -> SiLU -> LayerNorm, gather to
// edges, mean back per receiver, Linear): the chained backward passes against central finite
// differences, and float against double forward passes.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>

#include "core/model/nn/layers.h"
#include "core/model/nn/parameters.h"
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

constexpr int kAtoms = 5, kIn = 4, kHidden = 6, kOut = 3;

struct Chain {
  ParameterLayout layout;
  Linear first, last;
  LayerNorm norm;
  std::vector<int> sender = {1, 0, 4, 4, 2, 3, 0};  // 7 edges; atom 4 sends twice
  std::vector<int> receiver_offsets = {0, 3, 3, 7};  // 3 receivers, the middle one has none

  Chain() {
    first = AddLinear(&layout, "first", kIn, kHidden);
    norm = AddLayerNorm(&layout, "norm", kHidden);
    last = AddLinear(&layout, "last", kHidden, kOut);
  }
};

template <typename T>
struct Activations {
  Matrix<T> pre, hidden, normed, edges, pooled, out;
  LayerNormCache<T> norm_cache;
};

template <typename T>
void Forward(const Chain& c, const T* p, const Matrix<T>& x, Activations<T>* a) {
  LinearForward(c.first, p, x, &a->pre);
  SiluForward(a->pre, &a->hidden);
  LayerNormForward(c.norm, p, a->hidden, &a->normed, &a->norm_cache);
  GatherRows(a->normed, c.sender, &a->edges);
  SegmentMean(a->edges, c.receiver_offsets, &a->pooled);
  LinearForward(c.last, p, a->pooled, &a->out);
}

void Backward(const Chain& c, const double* p, const Mat& x, const Mat& dy, double* g, Mat* dx) {
  Activations<double> a;
  Forward(c, p, x, &a);
  Mat d_pooled, d_edges, d_normed, d_hidden, d_pre;
  LinearBackward(c.last, p, a.pooled, dy, g, &d_pooled);
  SegmentMeanBackward(d_pooled, c.receiver_offsets, &d_edges);
  GatherRowsBackward(d_edges, c.sender, kAtoms, &d_normed);
  LayerNormBackward(c.norm, p, a.norm_cache, d_normed, g, &d_hidden);
  SiluBackward(a.pre, d_hidden, &d_pre);
  LinearBackward(c.first, p, x, d_pre, g, dx);
}

TEST(CompositeGradient, LinearSiluLayerNormGatherSegmentMeanLinear) {
  const Chain chain;
  LayerUnderTest t;
  t.params = RandomValues(chain.layout.size(), 40);
  t.input = RandomMatrix(kAtoms, kIn, 41);
  t.forward = [&chain](const Params& p, const Mat& x) {
    Activations<double> a;
    Forward(chain, p.data(), x, &a);
    return a.out;
  };
  t.backward = [&chain](const Params& p, const Mat& x, const Mat& dy, double* g, Mat* dx) {
    Backward(chain, p.data(), x, dy, g, dx);
  };
  const GradientReport r = CheckLayerGradients(t, 42);
  // Every parameter and every input entry of the 5 atoms reaches the output (atom 2 and 3 only
  // through the third receiver).
  EXPECT_EQ(r.entries_with_gradient, static_cast<int>(chain.layout.size()) + kAtoms * kIn);
}

TEST(CompositeForward, FloatAgreesWithDouble) {
  const Chain chain;
  // Initialised weights (so activations have the sizes training sees) and a random input.
  const std::vector<double> pd = Initialise<double>(chain.layout, 43);
  const std::vector<float> pf = Initialise<float>(chain.layout, 43);
  for (std::size_t i = 0; i < pd.size(); ++i) ASSERT_EQ(pf[i], static_cast<float>(pd[i]));
  const Mat xd = RandomMatrix(kAtoms, kIn, 44);
  const Matrix<float> xf = xd.cast<float>();

  Activations<double> ad;
  Activations<float> af;
  Forward(chain, pd.data(), xd, &ad);
  Forward(chain, pf.data(), xf, &af);
  const double scale = ad.out.cwiseAbs().maxCoeff();
  const double worst = (af.out.cast<double>() - ad.out).cwiseAbs().maxCoeff() / scale;
  // Float rounding (2^-24 = 6e-8 per operation) through a few dozen operations.
  EXPECT_LT(worst, 1e-5);
  EXPECT_GT(scale, 0.1);  // the comparison is not between two near-zero outputs
}

}  // namespace
}  // namespace nucleate::model::nn
