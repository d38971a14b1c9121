// The flat parameter layout and its deterministic initialisation (core/model/DESIGN.md,
// "Randomness": tensor k draws from item 2^32 - 1 - k).
#include "core/model/nn/parameters.h"

#include <gtest/gtest.h>

#include <cmath>

#include "core/common/error.h"
#include "core/random/random_stream.h"

namespace nucleate::model::nn {
namespace {

ParameterLayout ThreeTensors() {
  ParameterLayout layout;
  layout.Add("a.weight", 3, 4, TensorSpec::Init::kNormal, 0.5);
  layout.Add("a.bias", 1, 4, TensorSpec::Init::kZero, 0);
  layout.Add("norm.gain", 1, 4, TensorSpec::Init::kOne, 0);
  return layout;
}

TEST(ParameterLayout, OffsetsAreContiguousInOrderOfAddition) {
  const ParameterLayout layout = ThreeTensors();
  ASSERT_EQ(layout.tensors().size(), 3u);
  EXPECT_EQ(layout.tensor(0).offset, 0u);
  EXPECT_EQ(layout.tensor(1).offset, 12u);
  EXPECT_EQ(layout.tensor(2).offset, 16u);
  EXPECT_EQ(layout.size(), 20u);
  EXPECT_EQ(layout.Find("a.bias"), 1);
  EXPECT_EQ(layout.Find("norm.gain"), 2);
  EXPECT_EQ(layout.Find("absent"), -1);
}

TEST(ParameterLayout, RefusesRepeatedNamesAndEmptyShapes) {
  ParameterLayout layout = ThreeTensors();
  auto expect_refused = [&](const std::string& name, int rows, int cols, const char* field) {
    try {
      layout.Add(name, rows, cols, TensorSpec::Init::kZero, 0);
      ADD_FAILURE() << name << " " << rows << "x" << cols << " was accepted";
    } catch (const Error& e) {
      EXPECT_EQ(e.kind(), ErrorKind::kInvalidArgument);
      EXPECT_EQ(e.field(), field);
    }
  };
  expect_refused("a.bias", 1, 4, "name");
  expect_refused("b", 0, 4, "rows");
  expect_refused("b", 2, -1, "cols");
  // A refused Add leaves the layout as it was.
  EXPECT_EQ(layout.tensors().size(), 3u);
  EXPECT_EQ(layout.size(), 20u);
}

TEST(ParameterView, MapsTheTensorsRowMajorSlice) {
  const ParameterLayout layout = ThreeTensors();
  std::vector<double> values(layout.size());
  for (std::size_t i = 0; i < values.size(); ++i) values[i] = static_cast<double>(i);
  const auto weight = View(layout, 0, static_cast<const double*>(values.data()));
  EXPECT_EQ(weight.rows(), 3);
  EXPECT_EQ(weight.cols(), 4);
  EXPECT_EQ(weight(1, 2), 6.0);  // row-major: 1 * 4 + 2
  auto gain = View(layout, 2, values.data());
  gain(0, 3) = -1;
  EXPECT_EQ(values[19], -1.0);
}

TEST(Initialise, ConstantsAndTheDocumentedStreams) {
  const ParameterLayout layout = ThreeTensors();
  const std::vector<double> values = Initialise<double>(layout, 77);
  // Tensor 0 is N(0, 0.5^2) from item 2^32 - 1, step 0, purpose kInitialise.
  random::RandomStream stream(77, 0xFFFFFFFFu, 0, random::Purpose::kInitialise);
  for (int i = 0; i < 12; ++i) EXPECT_EQ(values[i], stream.Normal() * 0.5) << i;
  for (int i = 12; i < 16; ++i) EXPECT_EQ(values[i], 0.0);
  for (int i = 16; i < 20; ++i) EXPECT_EQ(values[i], 1.0);
}

TEST(Initialise, DeterministicPerSeedAndStableWhenTensorsAreAppended) {
  ParameterLayout layout = ThreeTensors();
  const std::vector<float> before = Initialise<float>(layout, 5);
  EXPECT_EQ(Initialise<float>(layout, 5), before);
  EXPECT_NE(Initialise<float>(layout, 6), before);
  layout.Add("b.weight", 2, 2, TensorSpec::Init::kNormal, 1.0);
  const std::vector<float> after = Initialise<float>(layout, 5);
  ASSERT_EQ(after.size(), before.size() + 4);
  EXPECT_TRUE(std::equal(before.begin(), before.end(), after.begin()));
  // Tensors draw from different items, so the new one does not repeat the first one's numbers.
  EXPECT_NE(after[20], 2 * after[0]);
}

TEST(Initialise, NormalTensorHasTheRequestedScale) {
  // Sample standard deviation of 1e5 draws: SE of the variance estimate is sqrt(2 / n) sigma^2
  // = 0.0045 sigma^2 (common practice, no source); bound 5 SE.
  ParameterLayout layout;
  layout.Add("big", 400, 250, TensorSpec::Init::kNormal, 0.1);
  const std::vector<double> values = Initialise<double>(layout, 1);
  double sum = 0, sum_squares = 0;
  for (double v : values) {
    sum += v;
    sum_squares += v * v;
  }
  const double n = static_cast<double>(values.size());
  EXPECT_NEAR(sum / n, 0.0, 5 * 0.1 / std::sqrt(n));
  EXPECT_NEAR(sum_squares / n, 0.01, 5 * std::sqrt(2 / n) * 0.01);
}

}  // namespace
}  // namespace nucleate::model::nn
