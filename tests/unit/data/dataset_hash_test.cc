#include "core/train/data/dataset_hash.h"

#include <cmath>
#include <limits>
#include <string>

#include <gtest/gtest.h>

#include "core/common/error.h"
#include "tests/unit/data/data_test_support.h"

namespace nucleate::train::data {
namespace {

using testing::CubicExample;

// The expected digest is Python's hashlib.sha256 (Debian's /usr/bin/python3) over the canonical
// bytes built independently with struct.pack, as dataset_hash.h describes them:
//   Q = lambda v: struct.pack('<Q', v % 2**64); D = lambda x: struct.pack('<d', x)
//   T = lambda s: Q(len(s)) + s
//   b = b"nucleate-training-data-v1\0" + Q(1)
//   b += T(b"x") + T(b"Fe") + Q(7) + Q(229) + Q(1)
//   b += b"".join(D(v) for v in [2., 0, 0, 0, 2., 0, 0, 0, 2.])
//   b += Q(26) + D(0.) + D(0.) + D(0.) + Q(1) + D(1.5)
//   hashlib.sha256(b).hexdigest()
TEST(DatasetHash, MatchesTheCanonicalBytesHashedByPythonHashlib) {
  TrainingExample e = CubicExample("x", "Fe", 2.0, {26}, 7, {1.5});
  e.space_group = 229;
  EXPECT_EQ(DatasetHash({e}, {0}),
            "7958c5aed7ee266ea667596ea84252bc613ed1376d08d69c4dd8ff40ebaa1ef1");
}

std::vector<TrainingExample> Examples() {
  return {CubicExample("b.cif#b", "ClNa", 5.64, {11, 17}, 7, {1.0}),
          CubicExample("a.cif#a", "Si", 5.431, {14, 14}, 7, {std::nan("")}),
          CubicExample("c.xyz@1", "W", 3.165, {74, 74}, 7, {2.0})};
}

TEST(DatasetHash, IndependentOfTheOrderOfTheTrainingIndices) {
  const std::vector<TrainingExample> examples = Examples();
  EXPECT_EQ(DatasetHash(examples, {0, 1, 2}), DatasetHash(examples, {2, 0, 1}));
  // The same examples stored in another order hash the same: the order is by source.
  const std::vector<TrainingExample> reversed = {examples[2], examples[1], examples[0]};
  EXPECT_EQ(DatasetHash(examples, {0, 1, 2}), DatasetHash(reversed, {0, 1, 2}));
}

TEST(DatasetHash, ChangesWithAnyTrainingDatum) {
  const std::vector<TrainingExample> examples = Examples();
  const std::string base = DatasetHash(examples, {0, 1, 2});
  EXPECT_NE(DatasetHash(examples, {0, 1}), base);

  std::vector<TrainingExample> moved = examples;
  moved[2].crystal.frac[1][2] = std::nextafter(moved[2].crystal.frac[1][2], 1.0);  // one ulp
  EXPECT_NE(DatasetHash(moved, {0, 1, 2}), base);

  std::vector<TrainingExample> relabelled = examples;
  relabelled[0].space_group = 225;
  EXPECT_NE(DatasetHash(relabelled, {0, 1, 2}), base);

  std::vector<TrainingExample> revalued = examples;
  revalued[0].properties[0] = 1.25;
  EXPECT_NE(DatasetHash(revalued, {0, 1, 2}), base);

  std::vector<TrainingExample> other_nan = examples;
  other_nan[1].properties[0] = -std::numeric_limits<double>::quiet_NaN();  // another NaN pattern
  EXPECT_EQ(DatasetHash(other_nan, {0, 1, 2}), base);
}

TEST(DatasetHash, RefusesAnIndexOutsideTheExamples) {
  try {
    DatasetHash(Examples(), {0, 3});
    FAIL() << "no error";
  } catch (const Error& e) {
    EXPECT_EQ(e.field(), "train[1]");
  }
}

}  // namespace
}  // namespace nucleate::train::data
