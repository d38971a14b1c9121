// Primitive cells from pure translations, the shortest basis, and lattice mappings.
#include <cmath>

#include <gtest/gtest.h>

#include "core/match/lattice_mapping.h"
#include "core/match/lattice_points.h"
#include "core/match/primitive_cell.h"
#include "tests/unit/match/match_support.h"

namespace nucleate::match {
namespace {

using testing::Textbook;

TEST(PrimitiveCell, RockSaltConventionalCellReducesToTwoAtomsOfQuarterVolume) {
  // Textbook: the fcc primitive cell holds a quarter of the cubic cell's volume (4 lattice points
  // per conventional cell), so NaCl's 8-atom cell reduces to one Na and one Cl.
  const auto conv = Textbook("NaCl rock salt");
  const auto prim = PrimitiveCell(conv, 0.25);
  ASSERT_EQ(prim.size(), 2u);
  EXPECT_NEAR(std::abs(prim.lattice.determinant()), std::abs(conv.lattice.determinant()) / 4, 1e-9);
  // fcc primitive vectors are face diagonals a / sqrt(2) (textbook geometry).
  const double a = conv.lattice.row(0).norm();
  for (int k = 0; k < 3; ++k) EXPECT_NEAR(prim.lattice.row(k).norm(), a / std::sqrt(2.0), 1e-9);
}

TEST(PrimitiveCell, SupercellOfCsClReducesBackToTwoAtoms) {
  const auto cscl = Textbook("CsCl");
  Eigen::Matrix3i m;
  m << 2, 1, 0, 0, 1, 0, 0, 1, 3;  // det 6, skewed: not just a stack of cubes
  const auto sc = symmetry::testing::Supercell(cscl, m);
  ASSERT_EQ(sc.size(), 12u);
  const auto prim = PrimitiveCell(sc, 0.25);
  EXPECT_EQ(prim.size(), 2u);
  EXPECT_NEAR(std::abs(prim.lattice.determinant()), std::abs(cscl.lattice.determinant()), 1e-8);
}

TEST(PrimitiveCell, GenericTriclinicCellIsLeftAlone) {
  const auto p1 = Textbook("triclinic P1 (generic)");
  const auto prim = PrimitiveCell(p1, 0.25);
  EXPECT_EQ(prim.size(), p1.size());
  EXPECT_EQ(prim.lattice, p1.lattice);
}

TEST(ShortestBasis, FindsTheCubeInsideASkewedBasis) {
  // Rows (1,0,0), (5,1,0), (-3,7,1) span the simple cubic lattice (unimodular): its successive
  // minima are 1, 1, 1 (definition of the simple cubic lattice).
  Eigen::Matrix3d skew;
  skew << 1, 0, 0, 5, 1, 0, -3, 7, 1;
  const Eigen::Matrix3d b = ShortestBasis(skew);
  for (int k = 0; k < 3; ++k) EXPECT_NEAR(b.row(k).norm(), 1.0, 1e-12);
  EXPECT_NEAR(b.determinant(), 1.0, 1e-12);  // right-handed, same volume
}

TEST(LatticeMapping, CubicLatticeHasFortyEightMappingsOntoItself) {
  // The cube's point group m-3m has 48 operations (International Tables Vol. A); each is an
  // orthonormal integer basis of the same lattice with lengths and angles unchanged. Both
  // handednesses are kept, so all 48 appear.
  const Eigen::Matrix3d cube = Eigen::Matrix3d::Identity();
  EXPECT_EQ(FindLatticeMappings(cube, cube, 0.2, 5.0, 1).size(), 48u);
  // A 2x1x1 superlattice index: only cells of volume 2 that look like the target qualify.
  Eigen::Matrix3d target = Eigen::Matrix3d::Identity();
  target(0, 0) = 2;
  const auto doubled = FindLatticeMappings(cube, target, 0.2, 5.0, 2);
  // Hand count: a along one of the 6 vectors of length 2 (+-2e_i), b and c along the 4 remaining
  // unit vectors perpendicular to it, ordered: 6 * 4 * 2 = 48.
  EXPECT_EQ(doubled.size(), 48u);
  for (const auto& m : doubled) EXPECT_EQ(std::abs(m.coefficients.determinant()), 2);
}

TEST(LatticeMapping, LengthsBeyondToleranceGiveNoMapping) {
  Eigen::Matrix3d stretched = Eigen::Matrix3d::Identity();
  stretched(2, 2) = 1.25;  // 25 % > 20 %
  EXPECT_TRUE(FindLatticeMappings(stretched, Eigen::Matrix3d::Identity(), 0.2, 5.0, 1).empty());
  stretched(2, 2) = 1.15;  // 15 % < 20 %
  EXPECT_FALSE(FindLatticeMappings(stretched, Eigen::Matrix3d::Identity(), 0.2, 5.0, 1).empty());
}

}  // namespace
}  // namespace nucleate::match
