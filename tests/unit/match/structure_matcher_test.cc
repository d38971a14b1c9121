// MatchStructures on textbook structures and their rewrites. Expected verdicts follow from the
// definition of "same crystal" (a rewrite of the description never changes the crystal) and from
// crystallography textbooks (rock salt and CsCl, zincblende and wurtzite are different structure
// types of the same composition); the reference suite checks agreement with pymatgen.
#include <cmath>
#include <string>

#include <gtest/gtest.h>

#include "core/common/error.h"
#include "core/match/structure_matcher.h"
#include "tests/unit/match/match_support.h"

namespace nucleate::match {
namespace {

using structure::Crystal;
using symmetry::testing::Permute;
using symmetry::testing::Perturb;
using symmetry::testing::RotateFrame;
using symmetry::testing::Supercell;
using symmetry::testing::Translate;
using symmetry::testing::Uniform;
using testing::ChangeBasis;
using testing::RandomCrystal;
using testing::RandomRotation;
using testing::Strain;
using testing::Textbook;

const char* const kTypes[] = {"NaCl rock salt", "CsCl",          "ZnS zincblende",
                              "ZnO wurtzite",   "TiO2 rutile",   "SrTiO3 cubic perovskite",
                              "CaF2 fluorite",  "MgAl2O4 spinel", "triclinic P1 (generic)"};

TEST(MatchStructures, RewritesOfTheDescriptionAlwaysMatchWithZeroDisplacement) {
  Uniform u(11);
  Eigen::Matrix3i cell_choice;
  cell_choice << 1, 1, 0, 0, 1, 0, 1, -1, 1;  // det 1
  for (const char* name : kTypes) {
    const Crystal c = Textbook(name);
    const Crystal rewrites[] = {
        RotateFrame(c, RandomRotation(u)),
        Permute(c, 5),
        Translate(c, Eigen::Vector3d(u.Next(), u.Next(), u.Next())),
        ChangeBasis(c, cell_choice),
        RotateFrame(Translate(Permute(ChangeBasis(c, cell_choice), 9), {0.3, 0.1, 0.7}),
                    RandomRotation(u)),
    };
    for (const Crystal& r : rewrites) {
      const MatchResult m = MatchStructures(c, r, MatchTolerances{});
      EXPECT_TRUE(m.match) << name << ": " << m.reason;
      EXPECT_LT(m.rms, 1e-6) << name;
      EXPECT_LT(m.max_displacement, 1e-6) << name;
      EXPECT_TRUE(m.reason.empty());
    }
  }
}

TEST(MatchStructures, SupercellMatchesThroughPrimitiveReductionOrSupercellSearch) {
  const Crystal rutile = Textbook("TiO2 rutile");
  Eigen::Matrix3i m;
  m << 1, 1, 0, -1, 1, 0, 0, 0, 2;  // det 4
  const Crystal sc = Supercell(rutile, m);
  // Default: both reduce to the 6-atom primitive cell first.
  EXPECT_TRUE(MatchStructures(rutile, sc, MatchTolerances{}).match);
  // Without primitive reduction the cells hold 6 and 24 sites: not comparable unless supercells
  // are allowed, then a superlattice of index 4 of rutile's lattice maps onto the supercell.
  MatchTolerances no_prim;
  no_prim.primitive_cell = false;
  const MatchResult strict = MatchStructures(rutile, sc, no_prim);
  EXPECT_FALSE(strict.match);
  EXPECT_EQ(strict.reason, "site counts differ: 6 vs 24");
  no_prim.allow_supercell = true;
  const MatchResult loose = MatchStructures(rutile, sc, no_prim);
  EXPECT_TRUE(loose.match) << loose.reason;
  EXPECT_LT(loose.rms, 1e-6);
  EXPECT_TRUE(MatchStructures(sc, rutile, no_prim).match);  // either order
}

TEST(MatchStructures, NoisySupercellNeedsTheSupercellSearch) {
  // 0.3 A noise exceeds the 0.25 A primitive-search tolerance, so the 16-atom supercell of rock
  // salt stays 16 atoms; its noise is small against the site tolerance (0.3 * (V/N)^(1/3) =
  // 0.3 * 2.82 A = 0.85 A).
  const Crystal nacl = Textbook("NaCl rock salt");
  const Crystal noisy = Perturb(Supercell(nacl, Eigen::Vector3i(2, 1, 1).asDiagonal()), 0.3, 3);
  const MatchResult strict = MatchStructures(nacl, noisy, MatchTolerances{});
  EXPECT_FALSE(strict.match);
  EXPECT_EQ(strict.reason, "site counts differ: 2 vs 16");
  MatchTolerances loose;
  loose.allow_supercell = true;
  const MatchResult m = MatchStructures(nacl, noisy, loose);
  EXPECT_TRUE(m.match) << m.reason;
  EXPECT_GT(m.rms, 0.01);
  EXPECT_LT(m.max_displacement, 0.3);
}

TEST(MatchStructures, StrainWithinToleranceMatchesAndBeyondDoesNot) {
  const Crystal rutile = Textbook("TiO2 rutile");
  Eigen::Matrix3d small = Eigen::Matrix3d::Zero();
  small(2, 2) = 0.08;  // c stretched 8 %: with volume rescaling a and c change by < 8 %
  const MatchResult within = MatchStructures(rutile, Strain(rutile, small), MatchTolerances{});
  EXPECT_TRUE(within.match) << within.reason;
  // A homogeneous strain keeps the fractional coordinates, so once the cells are mapped no site
  // has moved: the strain is judged by the lattice tolerances alone.
  EXPECT_LT(within.rms, 1e-9);
  Eigen::Matrix3d large = Eigen::Matrix3d::Zero();
  large(2, 2) = 0.6;  // 60 %: c/a changes by 60 %, beyond the 20 % length tolerance
  const MatchResult beyond = MatchStructures(rutile, Strain(rutile, large), MatchTolerances{});
  EXPECT_FALSE(beyond.match);
  EXPECT_EQ(beyond.reason, "no lattice mapping within tolerance");
  // Shear of 10 degrees exceeds the 5 degree angle tolerance (tan 10 deg = 0.176).
  Eigen::Matrix3d shear = Eigen::Matrix3d::Zero();
  shear(0, 2) = std::tan(10 * M_PI / 180);
  EXPECT_FALSE(MatchStructures(rutile, Strain(rutile, shear), MatchTolerances{}).match);
}

TEST(MatchStructures, VolumeScalingDecidesWhetherACompressedCopyMatches) {
  const Crystal cscl = Textbook("CsCl");
  const Crystal compressed = Strain(cscl, -0.3 * Eigen::Matrix3d::Identity());  // 70 % lengths
  EXPECT_TRUE(MatchStructures(cscl, compressed, MatchTolerances{}).match);
  MatchTolerances unscaled;
  unscaled.scale_volume = false;
  const MatchResult m = MatchStructures(cscl, compressed, unscaled);
  EXPECT_FALSE(m.match);  // 1 / 0.7 = 1.43 > 1.2
  EXPECT_EQ(m.reason, "no lattice mapping within tolerance");
}

TEST(MatchStructures, DifferentStructureTypesOfOneCompositionDoNotMatch) {
  // Rock salt (octahedral) vs CsCl type (cubic coordination), both as NaCl.
  Crystal cscl_type = Textbook("CsCl");
  for (int& z : cscl_type.numbers) z = z == 55 ? 11 : 17;
  const MatchResult rs = MatchStructures(Textbook("NaCl rock salt"), cscl_type, MatchTolerances{});
  EXPECT_FALSE(rs.match);
  EXPECT_FALSE(rs.reason.empty());
  // Zincblende (cubic stacking, 2-atom primitive cell) vs wurtzite (hexagonal, 4 atoms), as ZnS.
  Crystal wurtzite = Textbook("ZnO wurtzite");
  for (int& z : wurtzite.numbers) z = z == 8 ? 16 : z;
  const Crystal zb = Textbook("ZnS zincblende");
  const MatchResult zw = MatchStructures(zb, wurtzite, MatchTolerances{});
  EXPECT_FALSE(zw.match);
  EXPECT_EQ(zw.reason, "site counts differ: 2 vs 4");
  // Even letting zincblende's doubled cell compete, the stacking differs.
  MatchTolerances loose;
  loose.allow_supercell = true;
  EXPECT_FALSE(MatchStructures(zb, wurtzite, loose).match);
}

TEST(MatchStructures, DifferentElementsNeverMatch) {
  Crystal kcl = Textbook("NaCl rock salt");
  for (int& z : kcl.numbers) z = z == 11 ? 19 : z;
  const MatchResult m = MatchStructures(Textbook("NaCl rock salt"), kcl, MatchTolerances{});
  EXPECT_FALSE(m.match);
  EXPECT_EQ(m.reason, "composition differs");
  EXPECT_TRUE(std::isnan(m.rms));
}

TEST(MatchStructures, OneMovedAtomGivesTheHandDerivedDisplacements) {
  // Move one atom of an N-site cell by d: displacements are d on it, 0 elsewhere; removing the
  // mean d/N leaves |d|(N-1)/N on it and |d|/N on the others, so
  // max = |d| (N-1)/N and rms = |d| sqrt(N-1) / N (derived by hand).
  Uniform u(21);
  Crystal c = RandomCrystal({8, 8, 8, 12, 12, 14}, u, 12.0);
  Crystal moved = c;
  const Eigen::Vector3d d_cart(0.15, -0.1, 0.05);
  moved.frac[2] = structure::WrapFractional(
      moved.frac[2] + structure::CartesianToFractional(c.lattice, d_cart));
  MatchTolerances t;
  t.scale_volume = false;  // keep the cell: the unit is exactly (V/N)^(1/3)
  const MatchResult m = MatchStructures(c, moved, t);
  ASSERT_TRUE(m.match) << m.reason;
  const double n = 6, unit = std::cbrt(std::abs(c.lattice.determinant()) / n);
  EXPECT_NEAR(m.max_displacement, d_cart.norm() * (n - 1) / n / unit, 1e-9);
  EXPECT_NEAR(m.rms, d_cart.norm() * std::sqrt(n - 1) / n / unit, 1e-9);
}

TEST(MatchStructures, SiteToleranceIsTheThreshold) {
  // The same single-atom move just below and above the tolerance (derived as above).
  Uniform u(4);
  const Crystal c = RandomCrystal({8, 8, 8, 12, 12, 14}, u, 12.0);
  const double unit = std::cbrt(std::abs(c.lattice.determinant()) / 6.0);
  MatchTolerances t;
  t.scale_volume = false;
  for (double target : {0.25, 0.35}) {
    Crystal moved = c;
    const double length = target * unit * 6.0 / 5.0;  // max = length * 5/6 in units
    moved.frac[0] = structure::WrapFractional(
        moved.frac[0] + structure::CartesianToFractional(c.lattice, {length, 0, 0}));
    const MatchResult m = MatchStructures(c, moved, t);
    if (target < 0.3) {
      EXPECT_TRUE(m.match) << m.reason;
    } else {
      EXPECT_FALSE(m.match);
      EXPECT_EQ(m.reason.rfind("sites too far: max ", 0), 0u) << m.reason;
    }
  }
}

TEST(MatchStructures, MirrorImageMatches) {
  // Documented choice (lattice_mapping.h): enantiomorphs count as the same structure.
  Uniform u(8);
  const Crystal c = RandomCrystal({6, 7, 8, 8}, u, 10.0);
  Crystal mirror = c;
  mirror.lattice.col(0) *= -1;  // x -> -x
  const MatchResult m = MatchStructures(c, mirror, MatchTolerances{});
  EXPECT_TRUE(m.match) << m.reason;
  EXPECT_LT(m.rms, 1e-6);
}

TEST(MatchStructures, BadInputRaisesNamingTheField) {
  const Crystal c = Textbook("CsCl");
  MatchTolerances t;
  t.site_tolerance = -1;
  try {
    MatchStructures(c, c, t);
    FAIL() << "negative tolerance accepted";
  } catch (const Error& e) {
    EXPECT_EQ(e.kind(), ErrorKind::kInvalidArgument);
    EXPECT_EQ(e.field(), "site_tolerance");
  }
  Crystal broken = c;
  broken.frac[1][0] = std::nan("");
  try {
    MatchStructures(c, broken, MatchTolerances{});
    FAIL() << "NaN accepted";
  } catch (const Error& e) {
    EXPECT_EQ(e.field(), "b.frac_coords[3]");  // site 1, x
  }
}

}  // namespace
}  // namespace nucleate::match
