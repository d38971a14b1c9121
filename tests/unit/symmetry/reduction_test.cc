// Niggli and Delaunay reduction of the lattice, with the atoms carried along.
#include <cmath>

#include <gtest/gtest.h>

#include "core/symmetry/symmetry.h"
#include "tests/unit/symmetry/structure_transforms.h"
#include "tests/unit/symmetry/textbook_structures.h"

namespace nucleate::symmetry::testing {
namespace {

constexpr double kA = 3.615;  // Cu lattice constant, angstrom (from memory)
constexpr double kDeg = 180.0 / 3.14159265358979323846;

structure::Crystal CuPrimitiveSkewed() {
  // The fcc primitive vectors a/2 (0,1,1), (1,0,1), (1,1,0) (common practice, no source),
  // mixed by a unimodular integer matrix (det 1) into a long, skewed basis of the same lattice.
  Eigen::Matrix3d primitive;
  primitive << 0, 0.5, 0.5, 0.5, 0, 0.5, 0.5, 0.5, 0;
  primitive *= kA;
  Eigen::Matrix3d m;
  m << 2, 1, 0, 3, 2, 0, 1, 4, 1;
  structure::Crystal c;
  c.lattice = m * primitive;
  c.numbers = {29};
  c.frac = {Eigen::Vector3d(0.3, 0.6, 0.1)};
  c.label = "Cu-skewed";
  return c;
}

double Angle(const Eigen::Vector3d& u, const Eigen::Vector3d& v) {
  return std::acos(u.dot(v) / (u.norm() * v.norm())) * kDeg;
}

// Every atom of `a` sits, in Cartesian space and modulo the lattice of `b`, on an atom of `b` of
// the same species, and the counts agree: the two cells describe the same crystal.
void ExpectSameCrystal(const structure::Crystal& a, const structure::Crystal& b) {
  ASSERT_EQ(a.size(), b.size());
  const Eigen::Matrix3d b_inv = b.lattice.inverse();
  for (std::size_t i = 0; i < a.size(); ++i) {
    const Eigen::Vector3d cart = a.lattice.transpose() * a.frac[i];
    const Eigen::Vector3d in_b = b_inv.transpose() * cart;
    double best = 1e9;
    for (std::size_t j = 0; j < b.size(); ++j) {
      if (b.numbers[j] != a.numbers[i]) continue;
      Eigen::Vector3d d = in_b - b.frac[j];
      for (int k = 0; k < 3; ++k) d[k] -= std::round(d[k]);
      best = std::min(best, (b.lattice.transpose() * d).norm());
    }
    EXPECT_LT(best, 1e-8) << "atom " << i;
  }
}

void ExpectWrapped(const structure::Crystal& c) {
  for (const auto& f : c.frac)
    for (int k = 0; k < 3; ++k) {
      EXPECT_GE(f[k], 0.0);
      EXPECT_LT(f[k], 1.0);
    }
}

TEST(Niggli, SkewedFccBasisGivesThePrimitiveRhombohedron) {
  const structure::Crystal skewed = CuPrimitiveSkewed();
  ASSERT_GT(skewed.lattice.row(2).norm(), 10.0);  // really skewed and long before reduction
  const structure::Crystal reduced = NiggliReduce(skewed);
  // fcc Niggli cell: a = b = c = a0 / sqrt 2, alpha = beta = gamma = 60 deg (ITA Vol. A, Niggli
  // form of cF; from memory).
  for (int i = 0; i < 3; ++i) EXPECT_NEAR(reduced.lattice.row(i).norm(), kA / std::sqrt(2.0), 1e-9);
  EXPECT_NEAR(Angle(reduced.lattice.row(1), reduced.lattice.row(2)), 60.0, 1e-7);
  EXPECT_NEAR(Angle(reduced.lattice.row(0), reduced.lattice.row(2)), 60.0, 1e-7);
  EXPECT_NEAR(Angle(reduced.lattice.row(0), reduced.lattice.row(1)), 60.0, 1e-7);
  ExpectSameCrystal(skewed, reduced);
  ExpectWrapped(reduced);
  EXPECT_EQ(reduced.label, skewed.label);
}

TEST(Niggli, SkewedConventionalSupercell) {
  // The 4-atom cubic cell of Cu in a skewed basis (a det-1 change of basis of the cubic cell):
  // its Niggli cell is the cube a0 x a0 x a0 with 90 deg angles, and the primitive cell of the
  // same crystal reduces to the 60 deg rhombohedron of edge a0 / sqrt 2.
  structure::Crystal cube;
  for (const auto& t : TextbookStructures())
    if (t.name == "Cu fcc") cube = t.crystal;
  ASSERT_EQ(cube.size(), 4u);
  Eigen::Matrix3i m;
  m << 1, 2, 0, 1, 3, 1, 0, 1, 2;  // det 1
  const structure::Crystal skewed = Supercell(cube, m);
  ASSERT_EQ(skewed.size(), 4u);
  const structure::Crystal reduced = NiggliReduce(skewed);
  for (int i = 0; i < 3; ++i) EXPECT_NEAR(reduced.lattice.row(i).norm(), kA, 1e-9);
  EXPECT_NEAR(Angle(reduced.lattice.row(0), reduced.lattice.row(1)), 90.0, 1e-7);
  ExpectSameCrystal(skewed, reduced);
  ExpectWrapped(reduced);

  const structure::Crystal primitive = NiggliReduce(StandardPrimitiveCell(skewed));
  ASSERT_EQ(primitive.size(), 1u);
  for (int i = 0; i < 3; ++i)
    EXPECT_NEAR(primitive.lattice.row(i).norm(), kA / std::sqrt(2.0), 1e-6);
  EXPECT_NEAR(Angle(primitive.lattice.row(0), primitive.lattice.row(1)), 60.0, 1e-5);
}

TEST(Niggli, ConditionsHoldForAGenericTriclinicCell) {
  // Main Niggli conditions (ITA Vol. A, section on reduced bases; from memory): a.a <= b.b <=
  // c.c, |2 b.c| <= b.b, |2 a.c| <= a.a, |2 a.b| <= a.a, and the three products all positive or
  // all non-positive.
  structure::Crystal c;
  for (const auto& t : TextbookStructures())
    if (t.name == "triclinic P-1 (generic)") c = t.crystal;
  Eigen::Matrix3i m;
  m << 1, 3, 1, 0, 1, 2, 1, 2, 2;  // det 3: a skewed triple supercell
  const int det = static_cast<int>(std::lround(m.cast<double>().determinant()));
  ASSERT_GE(det, 1);
  const structure::Crystal skewed = Supercell(c, m);
  const structure::Crystal r = NiggliReduce(skewed);
  const Eigen::Matrix3d g = r.lattice * r.lattice.transpose();
  const double tol = 1e-6;
  EXPECT_LE(g(0, 0), g(1, 1) + tol);
  EXPECT_LE(g(1, 1), g(2, 2) + tol);
  EXPECT_LE(std::abs(2 * g(1, 2)), g(1, 1) + tol);
  EXPECT_LE(std::abs(2 * g(0, 2)), g(0, 0) + tol);
  EXPECT_LE(std::abs(2 * g(0, 1)), g(0, 0) + tol);
  const bool all_positive = g(1, 2) > 0 && g(0, 2) > 0 && g(0, 1) > 0;
  const bool all_non_positive = g(1, 2) <= tol && g(0, 2) <= tol && g(0, 1) <= tol;
  EXPECT_TRUE(all_positive || all_non_positive) << g;
  EXPECT_NEAR(std::abs(r.lattice.determinant()), std::abs(skewed.lattice.determinant()), 1e-8);
  ExpectSameCrystal(skewed, r);
  EXPECT_EQ(AnalyseSymmetry(r).number, 2);
}

TEST(Delaunay, SuperbaseHasNoAcuteAngles) {
  // Delaunay reduced: with b4 = -(b1 + b2 + b3) every b_i . b_j (i < j) is <= 0 (Delaunay's
  // reduction, ITA Vol. A; from memory).
  for (const structure::Crystal& c : {CuPrimitiveSkewed(), NiggliReduce(CuPrimitiveSkewed())}) {
    const structure::Crystal r = DelaunayReduce(c);
    std::vector<Eigen::Vector3d> b = {r.lattice.row(0), r.lattice.row(1), r.lattice.row(2)};
    b.push_back(-(b[0] + b[1] + b[2]));
    for (int i = 0; i < 4; ++i)
      for (int j = i + 1; j < 4; ++j) EXPECT_LE(b[i].dot(b[j]), 1e-8) << i << j;
    EXPECT_NEAR(std::abs(r.lattice.determinant()), std::abs(c.lattice.determinant()), 1e-8);
    ExpectSameCrystal(c, r);
    ExpectWrapped(r);
  }
}

}  // namespace
}  // namespace nucleate::symmetry::testing
