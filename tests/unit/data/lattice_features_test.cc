#include "core/model/lattice_features.h"

#include <cmath>
#include <functional>
#include <limits>
#include <random>
#include <string>

#include <gtest/gtest.h>

#include "core/common/error.h"
#include "core/structure/lattice.h"

namespace nucleate::model {
namespace {

std::string FieldOf(const std::function<void()>& f, ErrorKind* kind = nullptr) {
  try {
    f();
  } catch (const Error& e) {
    if (kind) *kind = e.kind();
    return e.field();
  }
  return "(no error)";
}

Eigen::Matrix3d RandomRotation(std::mt19937_64& rng, bool allow_reflection) {
  std::normal_distribution<double> normal;
  Eigen::Matrix3d m;
  for (int k = 0; k < 9; ++k) m(k / 3, k % 3) = normal(rng);
  Eigen::Matrix3d q = Eigen::HouseholderQR<Eigen::Matrix3d>(m).householderQ();
  if (!allow_reflection && q.determinant() < 0) q.col(0) *= -1.0;
  return q;
}

// Skewed triclinic cells (lengths 2..30 A, angles 30..150 degrees) in random orientations.
std::vector<Eigen::Matrix3d> SkewedCells(int count, std::uint64_t seed) {
  std::mt19937_64 rng(seed);
  std::uniform_real_distribution<double> length(2.0, 30.0), angle(30.0, 150.0);
  std::vector<Eigen::Matrix3d> cells;
  while (static_cast<int>(cells.size()) < count) {
    structure::LatticeParameters p{length(rng), length(rng), length(rng),
                                   angle(rng),  angle(rng),  angle(rng)};
    try {
      cells.push_back(structure::MatrixFromParameters(p) * RandomRotation(rng, true).transpose());
    } catch (const Error&) {
      // angles that cannot close a cell
    }
  }
  return cells;
}

double MaxAbs(const Eigen::Matrix3d& m) { return m.cwiseAbs().maxCoeff(); }

// expm(logm(G)) = G is an identity of the matrix functions (mathematical identity, no source).
TEST(LatticeFeatures, RoundTripKeepsTheMetricTensorOfSkewedCells) {
  int n = 1;
  for (const Eigen::Matrix3d& lattice : SkewedCells(300, 11)) {
    n = n % 97 + 1;
    const Eigen::Matrix3d back = FeaturesToLattice(LatticeToFeatures(lattice, n), n);
    const Eigen::Matrix3d g = lattice * lattice.transpose();
    const Eigen::Matrix3d g_back = back * back.transpose();
    EXPECT_LE(MaxAbs(g_back - g), 1e-10 * MaxAbs(g)) << "cell\n" << lattice;
    // Standard orientation (the Cholesky factor): a along x, b in the xy plane, right-handed.
    EXPECT_EQ(back(0, 1), 0.0);
    EXPECT_EQ(back(0, 2), 0.0);
    EXPECT_EQ(back(1, 2), 0.0);
    EXPECT_GT(back(0, 0), 0.0);
    EXPECT_GT(back(1, 1), 0.0);
    EXPECT_GT(back(2, 2), 0.0);
  }
}

// G = L L^T is unchanged by L -> L Q^T for orthogonal Q (rotation or reflection of the frame).
TEST(LatticeFeatures, FeaturesAreInvariantToRotationsAndReflections) {
  std::mt19937_64 rng(5);
  for (const Eigen::Matrix3d& lattice : SkewedCells(100, 23)) {
    const LatticeFeatures f = LatticeToFeatures(lattice, 12);
    const Eigen::Matrix3d turned = lattice * RandomRotation(rng, true).transpose();
    const LatticeFeatures g = LatticeToFeatures(turned, 12);
    EXPECT_LE((f - g).cwiseAbs().maxCoeff(), 1e-12 * (1.0 + f.cwiseAbs().maxCoeff()));
  }
}

// Worked by hand: a cubic cell of N atoms with volume N v has a^3 = N v, G = a^2 I and
// S = logm(G) = (2/3) ln(N v) I, so every diagonal feature is (2/3) ln(N v) - (2/3) ln N
// = (2/3) ln v, whatever N, and the off-diagonal ones are 0. For v = 8 A^3: (2/3) ln 8 = 2 ln 2
// = 1.3862943611198906 (ln 2 = 0.6931471805599453, from memory).
TEST(LatticeFeatures, CubicCellOfVolumeNvHasClosedFormFeatures) {
  for (int n : {1, 8, 27, 64}) {
    const double a = std::cbrt(8.0 * n);
    const LatticeFeatures f = LatticeToFeatures(a * Eigen::Matrix3d::Identity(), n);
    for (int k = 0; k < 3; ++k) EXPECT_NEAR(f[k], 1.3862943611198906, 1e-14) << "N = " << n;
    for (int k = 3; k < 6; ++k) EXPECT_NEAR(f[k], 0.0, 1e-14) << "N = " << n;
  }
}

// Worked by hand: a hexagonal cell (a = b, gamma = 120 degrees, c) has, in the ab block,
// G = a^2 [[1, -1/2], [-1/2, 1]] with eigenvalues a^2/2 (eigenvector (1, 1)/sqrt2) and 3a^2/2
// (eigenvector (1, -1)/sqrt2). Hence S00 = S11 = (ln(a^2/2) + ln(3a^2/2)) / 2 = 2 ln a + ln(3/4)/2,
// S01 = (ln(a^2/2) - ln(3a^2/2)) / 2 = -ln(3)/2, S22 = 2 ln c, S02 = S12 = 0.
TEST(LatticeFeatures, HexagonalCellHasClosedFormFeatures) {
  const double a = 3.0, c = 5.0;
  const int n = 4;
  const Eigen::Matrix3d lattice = structure::MatrixFromParameters({a, a, c, 90, 90, 120});
  const LatticeFeatures f = LatticeToFeatures(lattice, n);
  const double shift = 2.0 / 3.0 * std::log(4.0);
  EXPECT_NEAR(f[0], 2 * std::log(a) + 0.5 * std::log(0.75) - shift, 1e-13);
  EXPECT_NEAR(f[1], 2 * std::log(a) + 0.5 * std::log(0.75) - shift, 1e-13);
  EXPECT_NEAR(f[2], 2 * std::log(c) - shift, 1e-13);
  EXPECT_NEAR(f[3], 0.0, 1e-13);
  EXPECT_NEAR(f[4], 0.0, 1e-13);
  EXPECT_NEAR(f[5], -std::sqrt(2.0) * std::log(3.0) / 2, 1e-13);
}

// expm(0) = I: zero features with N = 1 are the unit cube; with N atoms, the cube of volume N.
TEST(LatticeFeatures, ZeroFeaturesGiveTheCubeOfVolumeN) {
  const Eigen::Matrix3d unit = FeaturesToLattice(LatticeFeatures::Zero(), 1);
  EXPECT_LE(MaxAbs(unit - Eigen::Matrix3d::Identity()), 1e-15);
  const Eigen::Matrix3d cube = FeaturesToLattice(LatticeFeatures::Zero(), 27);
  EXPECT_LE(MaxAbs(cube - 3.0 * Eigen::Matrix3d::Identity()), 1e-14);
}

TEST(LatticeFeatures, RefusesBadInputNamingTheField) {
  ErrorKind kind{};
  Eigen::Matrix3d nan_cell = 4.0 * Eigen::Matrix3d::Identity();
  nan_cell(1, 2) = std::numeric_limits<double>::quiet_NaN();
  EXPECT_EQ(FieldOf([&] { LatticeToFeatures(nan_cell, 2); }, &kind), "lattice[5]");
  EXPECT_EQ(kind, ErrorKind::kInvalidArgument);
  Eigen::Matrix3d flat = 4.0 * Eigen::Matrix3d::Identity();
  flat.row(2) = flat.row(0);
  EXPECT_EQ(FieldOf([&] { LatticeToFeatures(flat, 2); }), "lattice");
  EXPECT_EQ(FieldOf([&] { LatticeToFeatures(Eigen::Matrix3d::Identity(), 0); }), "atom_count");

  LatticeFeatures f = LatticeFeatures::Zero();
  f[4] = std::numeric_limits<double>::infinity();
  EXPECT_EQ(FieldOf([&] { FeaturesToLattice(f, 3); }, &kind), "features[4]");
  EXPECT_EQ(kind, ErrorKind::kInvalidArgument);
  // exp(2000) overflows a double (largest ~1.8e308 = exp(709.8), IEEE 754 binary64).
  f.setZero();
  f[0] = 2000.0;
  EXPECT_EQ(FieldOf([&] { FeaturesToLattice(f, 3); }, &kind), "features");
  EXPECT_EQ(kind, ErrorKind::kNumerical);
  // One eigenvalue exp(-800) underflows to 0: no cell.
  f.setZero();
  f[2] = -800.0;
  EXPECT_EQ(FieldOf([&] { FeaturesToLattice(f, 3); }, &kind), "features");
  EXPECT_EQ(kind, ErrorKind::kNumerical);
}

// Worked by hand: two cubic cells with v = 8 and 27 A^3 per atom have diagonal features
// (2/3) ln 8 = 2 ln 2 and (2/3) ln 27 = 2 ln 3: mean ln 6, population std ln 3 - ln 2 = ln 1.5.
// Off-diagonal features are 0 for both: std 0, raised to the floor.
TEST(LatticeStatistics, MeanAndStdOfTwoCubicCells) {
  const LatticeStatistics stats =
      ComputeLatticeStatistics({{2.0 * Eigen::Matrix3d::Identity(), 1},
                                {6.0 * Eigen::Matrix3d::Identity(), 8}});
  for (int k = 0; k < 3; ++k) {
    EXPECT_NEAR(stats.mean[k], std::log(6.0), 1e-14);
    EXPECT_NEAR(stats.std[k], std::log(1.5), 1e-14);
  }
  for (int k = 3; k < 6; ++k) {
    EXPECT_NEAR(stats.mean[k], 0.0, 1e-15);
    EXPECT_EQ(stats.std[k], kMinLatticeFeatureStd);
  }
  // The cell with v = 27 standardises to +1 on the diagonal, 0 off it.
  const LatticeFeatures z =
      stats.Standardise(LatticeToFeatures(6.0 * Eigen::Matrix3d::Identity(), 8));
  for (int k = 0; k < 3; ++k) EXPECT_NEAR(z[k], 1.0, 1e-13);
  for (int k = 3; k < 6; ++k) EXPECT_NEAR(z[k], 0.0, 1e-12);
  LatticeFeatures some;
  some << 0.3, -1.2, 2.5, 0.1, -0.7, 1.9;
  EXPECT_LE((stats.Unstandardise(stats.Standardise(some)) - some).cwiseAbs().maxCoeff(), 1e-14);
}

TEST(LatticeStatistics, RefusesEmptyInputAndBrokenStatistics) {
  EXPECT_EQ(FieldOf([] { ComputeLatticeStatistics({}); }), "cells");
  EXPECT_EQ(FieldOf([] {
              ComputeLatticeStatistics({{Eigen::Matrix3d::Identity(), 1},
                                        {Eigen::Matrix3d::Zero(), 1}});
            }),
            "cells[1].lattice");
  LatticeStatistics broken;
  broken.std[2] = 0.0;
  EXPECT_EQ(FieldOf([&] { broken.Standardise(LatticeFeatures::Zero()); }), "std[2]");
  EXPECT_EQ(FieldOf([&] { broken.Unstandardise(LatticeFeatures::Zero()); }), "std[2]");
  broken.std[2] = 1.0;
  broken.mean[0] = std::numeric_limits<double>::quiet_NaN();
  EXPECT_EQ(FieldOf([&] { broken.Standardise(LatticeFeatures::Zero()); }), "mean[0]");
}

}  // namespace
}  // namespace nucleate::model
