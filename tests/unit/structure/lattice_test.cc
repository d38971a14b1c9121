#include "core/structure/lattice.h"

#include <cmath>
#include <functional>
#include <limits>
#include <random>
#include <string>

#include <gtest/gtest.h>

#include "core/common/error.h"
#include "tests/unit/structure/crystal_builders.h"

namespace nucleate::structure {
namespace {

constexpr double kDeg = 3.14159265358979323846 / 180;

std::string FieldOf(const std::function<void()>& f) {
  try {
    f();
  } catch (const Error& e) {
    return e.field();
  }
  return "(no error)";
}

TEST(Lattice, ParameterRoundTripOverRandomTriclinicCells) {
  std::mt19937_64 rng(7);
  std::uniform_real_distribution<double> len(1.0, 40.0), ang(25.0, 155.0);
  int tested = 0;
  while (tested < 500) {
    LatticeParameters p{len(rng), len(rng), len(rng), ang(rng), ang(rng), ang(rng)};
    Eigen::Matrix3d m;
    try {
      m = MatrixFromParameters(p);
    } catch (const Error&) {
      continue;  // angles that do not close a cell
    }
    const LatticeParameters q = ParametersFromMatrix(m);
    EXPECT_NEAR(q.a, p.a, 1e-12 * p.a);
    EXPECT_NEAR(q.b, p.b, 1e-12 * p.b);
    EXPECT_NEAR(q.c, p.c, 1e-12 * p.c);
    EXPECT_NEAR(q.alpha, p.alpha, 1e-10);
    EXPECT_NEAR(q.beta, p.beta, 1e-10);
    EXPECT_NEAR(q.gamma, p.gamma, 1e-10);
    // Standard orientation: a along x, b in the xy plane, right-handed.
    EXPECT_EQ(m(0, 1), 0.0);
    EXPECT_EQ(m(0, 2), 0.0);
    EXPECT_EQ(m(1, 2), 0.0);
    EXPECT_GT(m(1, 1), 0.0);
    EXPECT_GT(m(2, 2), 0.0);
    // Volume: V = abc sqrt(1 - cos^2 a - cos^2 b - cos^2 g + 2 cos a cos b cos g), the textbook
    // triclinic formula (International Tables for Crystallography Vol. B, sec. 1.1; from memory).
    const double ca = std::cos(p.alpha * kDeg), cb = std::cos(p.beta * kDeg), cg = std::cos(p.gamma * kDeg);
    const double v = p.a * p.b * p.c * std::sqrt(1 - ca * ca - cb * cb - cg * cg + 2 * ca * cb * cg);
    EXPECT_NEAR(SignedVolume(m), v, 1e-10 * v);
    ++tested;
  }
}

TEST(Lattice, RoundTripFromARotatedMatrix) {
  const Eigen::Matrix3d m = testing::SkewedLattice(3.1, 7.4, 12.9, 71.5, 103.2, 118.9, 1.1);
  const LatticeParameters p = ParametersFromMatrix(m);
  EXPECT_NEAR(p.alpha, 71.5, 1e-10);
  EXPECT_NEAR(p.beta, 103.2, 1e-10);
  EXPECT_NEAR(p.gamma, 118.9, 1e-10);
  // Rebuilt in standard orientation it differs by a rotation only: same metric tensor.
  const Eigen::Matrix3d s = MatrixFromParameters(p);
  EXPECT_LT((s * s.transpose() - m * m.transpose()).norm(), 1e-10);
}

TEST(Lattice, CubicCellIsExactlyDiagonal) {
  const Eigen::Matrix3d m = MatrixFromParameters({4.2, 4.2, 4.2, 90, 90, 90});
  EXPECT_EQ(m, testing::Cubic(4.2));
}

TEST(Lattice, AnglesNearZeroAndStraightAreAccurate) {
  // acos(cos) would lose half the digits here; atan2 keeps them.
  Eigen::Matrix3d m;
  m << 1, 0, 0, std::cos(1e-6 * kDeg), std::sin(1e-6 * kDeg), 0, 0, 0, 1;
  EXPECT_NEAR(ParametersFromMatrix(m).gamma, 1e-6, 1e-15);
}

TEST(Lattice, SignedVolumeSeesLeftHandedCells) {
  Eigen::Matrix3d m = testing::Cubic(2.0);
  EXPECT_DOUBLE_EQ(SignedVolume(m), 8.0);
  m.row(0).swap(m.row(1));
  EXPECT_DOUBLE_EQ(SignedVolume(m), -8.0);
}

TEST(Lattice, ReciprocalRowsAreDualToCellRows) {
  const Eigen::Matrix3d m = testing::SkewedLattice(2.5, 9.0, 4.0, 35, 140, 120);
  const Eigen::Matrix3d r = ReciprocalLattice(m);
  EXPECT_LT((m * r.transpose() - Eigen::Matrix3d::Identity()).norm(), 1e-14);
  // |b_3| is 1 / (spacing of the ab planes) = |a x b| / V.
  EXPECT_NEAR(r.row(2).norm(), m.row(0).cross(m.row(1)).norm() / std::fabs(SignedVolume(m)), 1e-14);
}

TEST(Lattice, FractionalCartesianRoundTrip) {
  const Eigen::Matrix3d m = testing::SkewedLattice(2.5, 9.0, 4.0, 35, 140, 120);
  const Eigen::Vector3d f(0.1, -0.7, 2.3);
  const Eigen::Vector3d x = FractionalToCartesian(m, f);
  EXPECT_LT((x - (0.1 * m.row(0) - 0.7 * m.row(1) + 2.3 * m.row(2)).transpose()).norm(), 1e-13);
  EXPECT_LT((CartesianToFractional(m, x) - f).norm(), 1e-13);
}

TEST(Lattice, WrapNeverReturnsOne) {
  EXPECT_EQ(WrapFraction(-1e-17), 0.0);   // 1 - 1e-17 rounds to 1.0: must become 0
  EXPECT_EQ(WrapFraction(-0.0), 0.0);
  EXPECT_EQ(WrapFraction(1.0), 0.0);
  EXPECT_EQ(WrapFraction(3.0), 0.0);
  EXPECT_EQ(WrapFraction(-0.25), 0.75);
  EXPECT_EQ(WrapFraction(2.5), 0.5);
  EXPECT_GT(WrapFraction(-1e-300), 0.0 - 1e-300);
  EXPECT_LT(WrapFraction(std::nextafter(1.0, 0.0)), 1.0);
  EXPECT_TRUE(std::isnan(WrapFraction(std::numeric_limits<double>::quiet_NaN())));
  const Eigen::Vector3d w = WrapFractional({-1e-17, 1.25, -3.5});
  EXPECT_EQ(w, Eigen::Vector3d(0.0, 0.25, 0.5));
}

TEST(Lattice, ErrorsNameTheField) {
  EXPECT_EQ(FieldOf([] { MatrixFromParameters({0, 1, 1, 90, 90, 90}); }), "a");
  EXPECT_EQ(FieldOf([] { MatrixFromParameters({1, -1, 1, 90, 90, 90}); }), "b");
  EXPECT_EQ(FieldOf([] { MatrixFromParameters({1, 1, NAN, 90, 90, 90}); }), "c");
  EXPECT_EQ(FieldOf([] { MatrixFromParameters({1, 1, 1, 180, 90, 90}); }), "alpha");
  EXPECT_EQ(FieldOf([] { MatrixFromParameters({1, 1, 1, 90, 0, 90}); }), "beta");
  // 30 + 30 < 90: the three vectors cannot close a cell.
  EXPECT_EQ(FieldOf([] { MatrixFromParameters({1, 1, 1, 30, 30, 90}); }), "gamma");
  Eigen::Matrix3d m = testing::Cubic(1);
  m(1, 1) = NAN;
  EXPECT_EQ(FieldOf([&] { ParametersFromMatrix(m); }), "lattice[4]");
  EXPECT_EQ(FieldOf([] { ReciprocalLattice(Eigen::Matrix3d::Zero()); }), "lattice");
}

}  // namespace
}  // namespace nucleate::structure
