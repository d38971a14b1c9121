// The space group is a property of the crystal, not of its description: the same structure in a
// rotated frame, with a shifted origin, with its atoms reordered, or as a supercell, has the same
// group (common practice, no source). A 0.01 A perturbation stays within symprec = 0.1 A.
#include <gtest/gtest.h>

#include "core/symmetry/symmetry.h"
#include "tests/unit/symmetry/structure_transforms.h"
#include "tests/unit/symmetry/textbook_structures.h"

namespace nucleate::symmetry::testing {
namespace {

std::size_t PureTranslations(const SymmetryInfo& info) {
  std::size_t n = 0;
  for (const auto& op : info.operations) n += op.rotation == Eigen::Matrix3i::Identity();
  return n;
}

TEST(Invariance, RotatedTranslatedPermuted) {
  std::uint64_t seed = 1;
  for (const auto& t : TextbookStructures()) {
    const Eigen::Matrix3d r = AxisAngle(Eigen::Vector3d(0.3, -1.2, 0.7), 0.83);
    const structure::Crystal moved =
        Permute(Translate(RotateFrame(t.crystal, r), Eigen::Vector3d(0.137, 0.61, 0.29)), ++seed);
    const SymmetryInfo a = AnalyseSymmetry(t.crystal);
    const SymmetryInfo b = AnalyseSymmetry(moved);
    EXPECT_EQ(b.number, t.number) << t.name;
    EXPECT_EQ(b.international, t.symbol) << t.name;
    EXPECT_EQ(b.hall_number, a.hall_number) << t.name;
    EXPECT_NEAR(b.PrimitiveVolume(), a.PrimitiveVolume(), 1e-8 * a.PrimitiveVolume()) << t.name;
  }
}

TEST(Invariance, Supercells) {
  Eigen::Matrix3i diagonal, skewed;
  diagonal << 2, 0, 0, 0, 1, 0, 0, 0, 2;
  skewed << 1, 1, 0, -1, 1, 0, 0, 1, 2;  // det 4
  for (const auto& t : TextbookStructures()) {
    if (t.crystal.size() > 30) continue;  // keep the big cells (corundum, spinel) out: time
    for (const auto& m : {diagonal, skewed}) {
      const structure::Crystal super = Supercell(t.crystal, m);
      ASSERT_EQ(super.size(), t.crystal.size() * static_cast<std::size_t>(
                                                      std::lround(m.cast<double>().determinant())));
      const SymmetryInfo info = AnalyseSymmetry(super);
      EXPECT_EQ(info.number, t.number) << t.name;
      EXPECT_EQ(info.international, t.symbol) << t.name;
      // The pure translations (identity rotations) of the supercell are det(M) times those of
      // the cell it was built from: the translation lattice is the same, the cell det(M) times
      // larger (common practice, no source). The point operations listed may be fewer: spglib
      // gives only those that map the supercell's own lattice onto itself.
      EXPECT_EQ(PureTranslations(info),
                PureTranslations(AnalyseSymmetry(t.crystal)) *
                    static_cast<std::size_t>(std::lround(m.cast<double>().determinant())))
          << t.name;
      // The primitive cell is the same lattice whatever cell was analysed.
      EXPECT_NEAR(info.PrimitiveVolume(), AnalyseSymmetry(t.crystal).PrimitiveVolume(), 1e-6)
          << t.name;
    }
  }
}

TEST(Invariance, PerturbedByAHundredthOfAnAngstrom) {
  std::uint64_t seed = 100;
  for (const auto& t : TextbookStructures()) {
    const structure::Crystal noisy = Perturb(t.crystal, 0.01, ++seed);
    EXPECT_EQ(AnalyseSymmetry(noisy, 0.1).number, t.number) << t.name;
    // Symmetrise removes the noise: the idealised cell is found at a tight tolerance.
    EXPECT_EQ(AnalyseSymmetry(Symmetrise(noisy, 0.1), 1e-5).number, t.number) << t.name;
  }
}

TEST(Invariance, PerturbationBreaksSymmetryAtATightTolerance) {
  // The perturbation is real: at symprec far below its 0.01 A size the cubic group is lost.
  for (const auto& t : TextbookStructures()) {
    if (t.name != "SrTiO3 cubic perovskite") continue;
    const structure::Crystal noisy = Perturb(t.crystal, 0.01, 7);
    EXPECT_LT(AnalyseSymmetry(noisy, 1e-4).number, t.number);
  }
}

TEST(Invariance, StandardConventionalCellWithoutIdealisationKeepsDistortion) {
  for (const auto& t : TextbookStructures()) {
    if (t.name != "Cu fcc") continue;
    const structure::Crystal primitive = StandardPrimitiveCell(t.crystal);
    const structure::Crystal noisy = Perturb(primitive, 0.01, 3);
    const structure::Crystal conv = StandardConventionalCell(noisy, 0.1, -1, false);
    const structure::Crystal ideal = StandardConventionalCell(noisy, 0.1, -1, true);
    ASSERT_EQ(conv.size(), 4u);
    ASSERT_EQ(ideal.size(), 4u);
    // Idealised: exactly cubic, axes along x, y, z (spglib's standard orientation).
    const Eigen::Matrix3d g = ideal.lattice * ideal.lattice.transpose();
    EXPECT_NEAR(g(0, 1), 0.0, 1e-10);
    EXPECT_NEAR(g(0, 0), g(2, 2), 1e-10);
    // Not idealised: the same 4 atoms, same volume as 4 primitive cells, no longer exact.
    EXPECT_NEAR(std::abs(conv.lattice.determinant()), 4 * std::abs(noisy.lattice.determinant()),
                1e-8);
  }
}

}  // namespace
}  // namespace nucleate::symmetry::testing
