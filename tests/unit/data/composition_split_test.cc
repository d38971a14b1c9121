#include "core/train/data/composition_split.h"

#include <algorithm>
#include <cmath>
#include <map>
#include <set>
#include <string>

#include <gtest/gtest.h>

#include "core/common/error.h"
#include "tests/unit/data/data_test_support.h"

namespace nucleate::train::data {
namespace {

// 1000 examples over 400 formulas, formula k holding (k % 4) + 1 examples, in an interleaved
// order so that examples of one formula are not neighbours.
std::vector<TrainingExample> GeneratedExamples() {
  std::vector<std::pair<int, int>> slots;  // (round, formula)
  for (int k = 0; k < 400; ++k) {
    for (int r = 0; r <= k % 4; ++r) slots.emplace_back(r, k);
  }
  std::sort(slots.begin(), slots.end());
  std::vector<TrainingExample> out;
  for (const auto& [round, k] : slots) {
    const std::string formula = "Li" + std::to_string(k + 1) + "O" + std::to_string(k % 7 + 1);
    out.push_back(testing::CubicExample(formula + "#" + std::to_string(round), formula, 4.0,
                                        {3, 8}, 1));
  }
  return out;
}

// FNV-1a test vectors (IETF draft-eastlake-fnv, test vectors for FNV-1a 64; from memory, and
// checked with a six-line Python loop over the published basis and prime).
TEST(CompositionSplit, Fnv1aMatchesPublishedVectors) {
  EXPECT_EQ(Fnv1a64(""), 0xcbf29ce484222325ULL);
  EXPECT_EQ(Fnv1a64("a"), 0xaf63dc4c8601ec8cULL);
  EXPECT_EQ(Fnv1a64("foobar"), 0x85944171f73967e8ULL);
}

TEST(CompositionSplit, EveryFormulaLandsInExactlyOneSplit) {
  const std::vector<TrainingExample> examples = GeneratedExamples();
  ASSERT_EQ(examples.size(), 1000u);
  const DatasetSplit split = SplitByComposition(examples, 0.1, 0.1, 42);
  std::map<std::string, std::set<int>> splits_of_formula;
  std::vector<int> seen(examples.size(), 0);
  const std::vector<const std::vector<std::size_t>*> parts = {&split.train, &split.validation,
                                                              &split.test};
  for (int p = 0; p < 3; ++p) {
    EXPECT_TRUE(std::is_sorted(parts[p]->begin(), parts[p]->end()));
    for (std::size_t i : *parts[p]) {
      ++seen[i];
      splits_of_formula[examples[i].formula].insert(p);
    }
  }
  for (std::size_t i = 0; i < seen.size(); ++i) EXPECT_EQ(seen[i], 1) << "example " << i;
  EXPECT_EQ(splits_of_formula.size(), 400u);
  for (const auto& [formula, in] : splits_of_formula) EXPECT_EQ(in.size(), 1u) << formula;
}

// Each formula's split is an independent Bernoulli-like draw, so the fraction of examples in a
// split has standard deviation sqrt(f (1 - f) sum n_i^2) / sum n_i: here sum n_i = 1000,
// sum n_i^2 = 100 (1 + 4 + 9 + 16) = 3000, so 0.0164 for f = 0.1 and 0.0198 for f = 0.2. The
// tolerance is 4 standard deviations (0.066 and 0.079): a correct hash fails it for a given seed
// with probability about 6e-5 (normal tail, common practice, no source).
TEST(CompositionSplit, FractionsAreMetWithinFourStandardDeviations) {
  const std::vector<TrainingExample> examples = GeneratedExamples();
  for (std::uint64_t seed : {1ULL, 2ULL, 3ULL, 12345ULL}) {
    const DatasetSplit split = SplitByComposition(examples, 0.1, 0.2, seed);
    const double n = static_cast<double>(examples.size());
    EXPECT_NEAR(split.validation.size() / n, 0.1, 4 * 0.0164) << "seed " << seed;
    EXPECT_NEAR(split.test.size() / n, 0.2, 4 * 0.0198) << "seed " << seed;
  }
  // 20000 distinct formulas: the fraction's standard deviation is sqrt(0.09 / 20000) = 0.0021.
  std::vector<TrainingExample> many;
  for (int k = 0; k < 20000; ++k) {
    many.push_back(testing::CubicExample("s", "C" + std::to_string(k + 1), 4.0, {6}, 1));
  }
  const DatasetSplit split = SplitByComposition(many, 0.1, 0.1, 7);
  EXPECT_NEAR(split.validation.size() / 20000.0, 0.1, 4 * 0.0021);
  EXPECT_NEAR(split.test.size() / 20000.0, 0.1, 4 * 0.0021);
}

TEST(CompositionSplit, DeterministicForTheSeedAndIndependentOfTheOtherExamples) {
  const std::vector<TrainingExample> examples = GeneratedExamples();
  const DatasetSplit a = SplitByComposition(examples, 0.1, 0.1, 42);
  const DatasetSplit b = SplitByComposition(examples, 0.1, 0.1, 42);
  EXPECT_EQ(a.train, b.train);
  EXPECT_EQ(a.validation, b.validation);
  EXPECT_EQ(a.test, b.test);
  const DatasetSplit other = SplitByComposition(examples, 0.1, 0.1, 43);
  EXPECT_NE(a.validation, other.validation);

  // Every other example dropped: each remaining formula stays in its split.
  std::vector<TrainingExample> half;
  std::vector<std::size_t> original;
  for (std::size_t i = 0; i < examples.size(); i += 2) {
    half.push_back(examples[i]);
    original.push_back(i);
  }
  const DatasetSplit h = SplitByComposition(half, 0.1, 0.1, 42);
  const std::set<std::size_t> validation(a.validation.begin(), a.validation.end());
  const std::set<std::size_t> test(a.test.begin(), a.test.end());
  for (std::size_t j : h.validation) EXPECT_TRUE(validation.count(original[j]));
  for (std::size_t j : h.test) EXPECT_TRUE(test.count(original[j]));
}

TEST(CompositionSplit, RefusesFractionsWithoutTrainingData) {
  const std::vector<TrainingExample> examples = GeneratedExamples();
  const auto field = [&](double v, double t) {
    try {
      SplitByComposition(examples, v, t, 1);
    } catch (const Error& e) {
      return e.field();
    }
    return std::string("(no error)");
  };
  EXPECT_EQ(field(-0.1, 0.1), "validation_fraction");
  EXPECT_EQ(field(0.1, 1.0), "test_fraction");
  EXPECT_EQ(field(0.5, 0.5), "test_fraction");
  EXPECT_EQ(field(std::nan(""), 0.1), "validation_fraction");
  EXPECT_EQ(field(0.0, 0.0), "(no error)");
}

}  // namespace
}  // namespace nucleate::train::data
