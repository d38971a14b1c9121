// Row gather, segment mean, segment broadcast and the per-segment mean removal: backward passes
// against central finite differences, empty segments, and the fixed (row-order) summation that
// keeps results independent of threads and vector width.
#include <gtest/gtest.h>

#include <cmath>

#include "core/common/error.h"
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

// Segments of 2, 0, 3, 0 rows, and a leading empty one: every kind of boundary.
const std::vector<int> kOffsets = {0, 0, 2, 2, 5, 5};
constexpr int kRows = 5;
constexpr int kSegments = 5;

TEST(GatherRowsGradient, MatchesFiniteDifferencesWithRepeatsAndUnusedRows) {
  const std::vector<int> index = {3, 0, 3, 1, 3, 0};  // row 2 never gathered
  LayerUnderTest t;
  t.input = RandomMatrix(4, 3, 20);
  t.forward = [index](const Params&, const Mat& x) {
    Mat y;
    GatherRows(x, index, &y);
    return y;
  };
  t.backward = [index](const Params&, const Mat& x, const Mat& dy, double*, Mat* dx) {
    if (dx != nullptr) GatherRowsBackward(dy, index, static_cast<int>(x.rows()), dx);
  };
  const GradientReport r = CheckLayerGradients(t, 21);
  EXPECT_EQ(r.entries_with_gradient, 3 * 3);
  EXPECT_EQ(r.entries_without_gradient, 3);
}

TEST(SegmentMeanGradient, MatchesFiniteDifferencesWithEmptySegments) {
  LayerUnderTest t;
  t.input = RandomMatrix(kRows, 3, 22);
  t.forward = [](const Params&, const Mat& x) {
    Mat y;
    SegmentMean(x, kOffsets, &y);
    return y;
  };
  t.backward = [](const Params&, const Mat&, const Mat& dy, double*, Mat* dx) {
    if (dx != nullptr) SegmentMeanBackward(dy, kOffsets, dx);
  };
  const GradientReport r = CheckLayerGradients(t, 23);
  EXPECT_EQ(r.entries_with_gradient, kRows * 3);
}

TEST(SegmentMean, EmptySegmentsAreZeroRows) {
  const Mat x = RandomMatrix(kRows, 3, 24);
  Mat y;
  SegmentMean(x, kOffsets, &y);
  ASSERT_EQ(y.rows(), kSegments);
  for (int s : {0, 2, 4}) EXPECT_TRUE(y.row(s).isZero(0)) << "segment " << s;
  EXPECT_TRUE(y.row(1).isApprox((x.row(0) + x.row(1)) / 2, 1e-15));
}

TEST(SegmentBroadcastGradient, MatchesFiniteDifferencesWithEmptySegments) {
  LayerUnderTest t;
  t.input = RandomMatrix(kSegments, 3, 25);
  t.forward = [](const Params&, const Mat& x) {
    Mat y;
    SegmentBroadcast(x, kOffsets, &y);
    return y;
  };
  t.backward = [](const Params&, const Mat&, const Mat& dy, double*, Mat* dx) {
    if (dx != nullptr) SegmentBroadcastBackward(dy, kOffsets, dx);
  };
  const GradientReport r = CheckLayerGradients(t, 26);
  // Only the two non-empty segments reach any output row.
  EXPECT_EQ(r.entries_with_gradient, 2 * 3);
  EXPECT_EQ(r.entries_without_gradient, 3 * 3);
}

TEST(RemoveSegmentMeanGradient, SelfAdjointProjectionMatchesFiniteDifferences) {
  // The header states the backward pass is the same projection applied to dy.
  LayerUnderTest t;
  t.input = RandomMatrix(kRows, 3, 27);
  t.forward = [](const Params&, const Mat& x) {
    Mat y = x;
    RemoveSegmentMean(kOffsets, &y);
    return y;
  };
  t.backward = [](const Params&, const Mat&, const Mat& dy, double*, Mat* dx) {
    if (dx == nullptr) return;
    *dx = dy;
    RemoveSegmentMean(kOffsets, dx);
  };
  const GradientReport r = CheckLayerGradients(t, 28);
  EXPECT_EQ(r.entries_with_gradient, kRows * 3);
}

TEST(RemoveSegmentMean, LeavesEachSegmentMeanFree) {
  Mat x = RandomMatrix(kRows, 3, 29);
  RemoveSegmentMean(kOffsets, &x);
  EXPECT_LT(((x.row(0) + x.row(1))).cwiseAbs().maxCoeff(), 1e-15);
  EXPECT_LT(((x.row(2) + x.row(3) + x.row(4))).cwiseAbs().maxCoeff(), 1e-15);
}

// Rows big, 1, 1, -big with big = 2^53: added in row order, big + 1 rounds back to big (ties to
// even, IEEE 754) twice and the total is 0; pairwise (a vectorised reduction) gives 1 and reverse
// order gives 2. So 0 shows the row order the header promises (IEEE 754 round-to-nearest-even;
// common practice, no source).
Mat OrderSensitiveRows() {
  const double big = 9007199254740992.0;  // 2^53
  Mat rows(4, 1);
  rows << big, 1, 1, -big;
  return rows;
}

TEST(FixedSummationOrder, GatherRowsBackwardAddsInRowOrder) {
  Mat dx;
  GatherRowsBackward(OrderSensitiveRows(), {0, 0, 0, 0}, 1, &dx);
  EXPECT_EQ(dx(0, 0), 0.0);
}

TEST(FixedSummationOrder, SegmentMeanAddsInRowOrder) {
  Mat y;
  SegmentMean(OrderSensitiveRows(), {0, 4}, &y);
  EXPECT_EQ(y(0, 0), 0.0);
}

TEST(FixedSummationOrder, SegmentBroadcastBackwardAddsInRowOrder) {
  Mat dx;
  SegmentBroadcastBackward(OrderSensitiveRows(), {0, 4}, &dx);
  EXPECT_EQ(dx(0, 0), 0.0);
}

TEST(RowOps, BadIndicesAndOffsetsAreInternalErrors) {
  const Mat x = RandomMatrix(3, 2, 30);
  Mat y;
  try {
    GatherRows(x, {0, 3}, &y);
    FAIL() << "an index past the last row was accepted";
  } catch (const Error& e) {
    EXPECT_EQ(e.kind(), ErrorKind::kInternal);
  }
  EXPECT_THROW(SegmentMean(x, {0, 2}, &y), Error);     // does not end at the row count
  EXPECT_THROW(SegmentMean(x, {0, 2, 1, 3}, &y), Error);  // decreasing
}

}  // namespace
}  // namespace nucleate::model::nn
