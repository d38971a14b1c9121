#include "core/structure/validate.h"

#include <cmath>
#include <functional>
#include <string>

#include <gtest/gtest.h>

#include "tests/unit/structure/crystal_builders.h"

namespace nucleate::structure {
namespace {

// The field and kind ValidateCrystal raises for `c`.
std::pair<std::string, ErrorKind> Raised(const Crystal& c, const StructureLimits& limits = {}) {
  try {
    ValidateCrystal(c, limits);
  } catch (const Error& e) {
    return {e.field(), e.kind()};
  }
  return {"(valid)", ErrorKind::kInternal};
}

const Crystal kGood = testing::RockSalt(11, 17, 5.64);

TEST(ValidateCrystal, AcceptsAGoodCrystalAndLeftHandedCells) {
  EXPECT_NO_THROW(ValidateCrystal(kGood, {}));
  Crystal left = kGood;
  left.lattice.row(0).swap(left.lattice.row(1));
  EXPECT_NO_THROW(ValidateCrystal(left, {}));
  EXPECT_FALSE(FindCrystalDefect(kGood, {}).has_value());
}

TEST(ValidateCrystal, EveryErrorNamesItsField) {
  using K = ErrorKind;
  Crystal c = kGood;
  c.lattice(2, 1) = NAN;
  EXPECT_EQ(Raised(c), std::make_pair(std::string("lattice[7]"), K::kInvalidArgument));
  c = kGood;
  c.lattice(0, 0) = INFINITY;
  EXPECT_EQ(Raised(c).first, "lattice[0]");

  c = kGood;
  c.lattice.row(2) = c.lattice.row(0) + c.lattice.row(1);  // coplanar: zero volume
  EXPECT_EQ(Raised(c), std::make_pair(std::string("lattice"), K::kInvalidArgument));
  c = kGood;
  c.lattice.row(1).setZero();
  EXPECT_EQ(Raised(c).first, "lattice");
  c = kGood;
  c.lattice(2, 2) = 600;
  EXPECT_EQ(Raised(c), std::make_pair(std::string("lattice"), K::kLimitExceeded));

  c = kGood;
  c.numbers[3] = 0;
  EXPECT_EQ(Raised(c), std::make_pair(std::string("atomic_numbers[3]"), K::kInvalidArgument));
  c.numbers[3] = 119;
  EXPECT_EQ(Raised(c).first, "atomic_numbers[3]");

  c = kGood;
  c.frac[7][1] = NAN;
  // Site 7, y: element 3 * 7 + 1 of the flat list, as in a Structure message.
  EXPECT_EQ(Raised(c), std::make_pair(std::string("frac_coords[22]"), K::kInvalidArgument));

  c = kGood;
  c.frac.pop_back();
  EXPECT_EQ(Raised(c).first, "frac_coords");

  c = kGood;
  c.numbers.clear();
  c.frac.clear();
  EXPECT_EQ(Raised(c).first, "atomic_numbers");

  StructureLimits small;
  small.max_atoms = 4;
  EXPECT_EQ(Raised(kGood, small), std::make_pair(std::string("atomic_numbers"), K::kLimitExceeded));
  StructureLimits absurd;
  absurd.max_atoms = StructureLimits::kCeilingMaxAtoms + 1;
  EXPECT_EQ(Raised(kGood, absurd).first, "max_atoms");
}

TEST(ValidateCrystal, DefectReportsNonFiniteSeparately) {
  Crystal c = kGood;
  c.frac[2][0] = NAN;
  auto d = FindCrystalDefect(c, {});
  ASSERT_TRUE(d.has_value());
  EXPECT_TRUE(d->non_finite);
  c = kGood;
  c.numbers[0] = -3;
  d = FindCrystalDefect(c, {});
  ASSERT_TRUE(d.has_value());
  EXPECT_FALSE(d->non_finite);
}

TEST(ValidateCrystal, NearlyFlatCellIsDegenerate) {
  Crystal c = kGood;
  c.lattice.row(2) = c.lattice.row(0) + c.lattice.row(1) + Eigen::RowVector3d(0, 0, 1e-12);
  EXPECT_EQ(Raised(c).first, "lattice");
}

}  // namespace
}  // namespace nucleate::structure
