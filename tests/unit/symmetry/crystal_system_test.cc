// Crystal systems by space-group number: the ranges of the International Tables for
// Crystallography Vol. A (triclinic 1-2, monoclinic 3-15, orthorhombic 16-74, tetragonal 75-142,
// trigonal 143-167, hexagonal 168-194, cubic 195-230). Every boundary is checked on both sides.
#include <gtest/gtest.h>

#include "core/symmetry/symmetry.h"

namespace nucleate::symmetry {
namespace {

TEST(CrystalSystem, RangesOfTheInternationalTables) {
  const struct {
    int first, last;
    CrystalSystem system;
    const char* name;
  } ranges[] = {{1, 2, CrystalSystem::kTriclinic, "triclinic"},
                {3, 15, CrystalSystem::kMonoclinic, "monoclinic"},
                {16, 74, CrystalSystem::kOrthorhombic, "orthorhombic"},
                {75, 142, CrystalSystem::kTetragonal, "tetragonal"},
                {143, 167, CrystalSystem::kTrigonal, "trigonal"},
                {168, 194, CrystalSystem::kHexagonal, "hexagonal"},
                {195, 230, CrystalSystem::kCubic, "cubic"}};
  int covered = 0;
  for (const auto& r : ranges) {
    for (int n = r.first; n <= r.last; ++n) {
      EXPECT_EQ(CrystalSystemOf(n), r.system) << n;
      EXPECT_STREQ(CrystalSystemName(CrystalSystemOf(n)), r.name) << n;
      ++covered;
    }
  }
  EXPECT_EQ(covered, 230);
}

}  // namespace
}  // namespace nucleate::symmetry
