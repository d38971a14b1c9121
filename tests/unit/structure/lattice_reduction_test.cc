#include "core/structure/lattice_reduction.h"

#include <random>

#include <gtest/gtest.h>

#include "tests/unit/structure/crystal_builders.h"

namespace nucleate::structure {
namespace {

TEST(LatticeReduction, UndoesAUnimodularShear) {
  // A cubic lattice sheared by an integer matrix of determinant 1 is the same lattice; LLL must
  // find three vectors of length a again (the cubic lattice's shortest basis; common practice,
  // no source).
  Eigen::Matrix3i shear;
  shear << 1, 7, -3, 0, 1, 5, 0, 0, 1;
  const Eigen::Matrix3d skewed = shear.cast<double>() * testing::Cubic(3.0);
  const ReducedLattice r = ReduceLattice(skewed);
  for (int k = 0; k < 3; ++k) EXPECT_NEAR(r.lattice.row(k).norm(), 3.0, 1e-12);
  EXPECT_LT((r.lattice - r.transform.cast<double>() * skewed).norm(), 1e-12);
  EXPECT_EQ(std::abs(r.transform.cast<double>().determinant()), 1.0);
  EXPECT_EQ(r.transform * r.inverse, Eigen::Matrix3i::Identity());
}

TEST(LatticeReduction, NeverLengthensAndKeepsTheVolume) {
  std::mt19937_64 rng(11);
  std::uniform_real_distribution<double> len(0.5, 30.0), ang(21.0, 159.0);
  int tested = 0;
  while (tested < 300) {
    const double alpha = ang(rng), beta = ang(rng), gamma = ang(rng);
    const Eigen::Matrix3d m = testing::SkewedLattice(len(rng), len(rng), len(rng), alpha, beta, gamma);
    if (!m.allFinite() || std::fabs(m.determinant()) < 1e-3) continue;
    const ReducedLattice r = ReduceLattice(m);
    EXPECT_NEAR(std::fabs(r.lattice.determinant()), std::fabs(m.determinant()),
                1e-9 * std::fabs(m.determinant()));
    EXPECT_LE(r.lattice.rowwise().norm().minCoeff(), m.rowwise().norm().minCoeff() * (1 + 1e-12));
    EXPECT_EQ(r.transform * r.inverse, Eigen::Matrix3i::Identity());
    ++tested;
  }
}

}  // namespace
}  // namespace nucleate::structure
