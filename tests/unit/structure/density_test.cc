#include "core/structure/density.h"

#include <cmath>

#include <gtest/gtest.h>

#include "core/common/error.h"
#include "tests/unit/structure/crystal_builders.h"

namespace nucleate::structure {
namespace {

TEST(Density, CopperFromItsLatticeConstant) {
  // fcc Cu, a = 3.6149 A (Kittel, ch. 1 table, from memory); CRC Handbook density 8.96 g/cm3.
  // 4 x 63.546 u / a^3 = 8.935; the handbook value is for the metal at 20 C and rounds to 0.03.
  Crystal cu = testing::RockSalt(29, 29, 3.6149);
  cu.numbers.resize(4);
  cu.frac.resize(4);
  EXPECT_NEAR(Density(cu), 8.96, 0.03);
  // Exactly: 4 x 63.546 x 1.66053906660 / 3.6149^3 (CODATA 2018 u, IUPAC weight).
  EXPECT_NEAR(Density(cu), 4 * 63.546 * 1.66053906660 / std::pow(3.6149, 3), 1e-12);
}

TEST(Density, UsesTheAbsoluteVolume) {
  Crystal c = testing::RockSalt(11, 17, 5.64);
  const double right = Density(c);
  c.lattice.row(0).swap(c.lattice.row(1));
  EXPECT_DOUBLE_EQ(Density(c), right);
  EXPECT_GT(right, 0);
}

TEST(Density, ValidatesTheCrystal) {
  Crystal c = testing::RockSalt(11, 17, 5.64);
  c.numbers[2] = 0;
  try {
    Density(c);
    FAIL();
  } catch (const Error& e) {
    EXPECT_EQ(e.field(), "atomic_numbers[2]");
  }
}

}  // namespace
}  // namespace nucleate::structure
