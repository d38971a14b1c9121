// The lattice screen against its definition: it must offer a target exactly when
// FindLatticeMappings finds a mapping (offering less would drop true matches; more would only cost
// time, but would mean the enumeration is not what lattice_index.h claims). Checked on lattices
// strained around the length and angle tolerances, so both verdicts occur often; and the box
// tree (its store) against a linear scan.
#include <gtest/gtest.h>

#include <algorithm>

#include "core/match/box_tree.h"
#include "core/match/lattice_index.h"
#include "core/match/lattice_mapping.h"
#include "core/match/lattice_points.h"
#include "tests/unit/match/match_support.h"

namespace nucleate::match {
namespace {

using symmetry::testing::Uniform;

constexpr double kLtol = 0.2, kAngle = 5.0;

// A random cell of volume 20 in its shortest basis (as PreparedCrystal holds it).
Eigen::Matrix3d RandomCell(Uniform& u) {
  structure::LatticeParameters p{1 + u.Next(), 1 + u.Next(), 1 + u.Next(),
                                 70 + 40 * u.Next(), 70 + 40 * u.Next(), 70 + 40 * u.Next()};
  Eigen::Matrix3d l = structure::MatrixFromParameters(p);
  l *= std::cbrt(20 / std::abs(l.determinant()));
  return ShortestBasis(l);
}

// `base` strained by a random symmetric strain of components up to `size`, rotated, rescaled to
// volume 20 and brought to its shortest basis.
Eigen::Matrix3d StrainedCell(const Eigen::Matrix3d& base, double size, Uniform& u) {
  Eigen::Matrix3d e;
  for (int i = 0; i < 3; ++i)
    for (int j = 0; j < 3; ++j) e(i, j) = size * (2 * u.Next() - 1);
  e = (e + e.transpose()) / 2;
  Eigen::Matrix3d l = base * (Eigen::Matrix3d::Identity() + e).transpose() *
                      testing::RandomRotation(u).transpose();
  l *= std::cbrt(20 / std::abs(l.determinant()));
  return ShortestBasis(l);
}

bool Mappable(const Eigen::Matrix3d& mover, const Eigen::Matrix3d& target) {
  return !FindLatticeMappings(mover, target, kLtol, kAngle, 1).empty();
}

TEST(LatticeScreen, PassesExactlyWhenALatticeMappingExists) {
  Uniform u(31);
  int passed = 0, rejected = 0;
  for (int trial = 0; trial < 600; ++trial) {
    const Eigen::Matrix3d target = RandomCell(u);
    const Eigen::Matrix3d mover = StrainedCell(target, 0.12 * u.Next(), u);
    const bool expected = Mappable(mover, target);
    EXPECT_EQ(LatticeScreenPasses(mover, target, kLtol, kAngle), expected) << "trial " << trial;
    (expected ? passed : rejected)++;
  }
  // Both verdicts in bulk, or the comparison above proves little.
  EXPECT_GT(passed, 150);
  EXPECT_GT(rejected, 150);
}

TEST(LatticeIndex, QueryReturnsExactlyTheMappableTargetsAtOrAboveMinId) {
  Uniform u(47);
  std::vector<Eigen::Matrix3d> bases;
  for (int k = 0; k < 4; ++k) bases.push_back(RandomCell(u));
  std::vector<Eigen::Matrix3d> targets;
  LatticeIndex index(kLtol, kAngle);
  for (int id = 0; id < 300; ++id) {
    targets.push_back(StrainedCell(bases[u.Below(4)], 0.15, u));
    index.Insert(id, targets.back());
  }
  long offered = 0;
  for (int q = 0; q < 60; ++q) {
    const Eigen::Matrix3d mover = StrainedCell(bases[u.Below(4)], 0.15, u);
    const int min_id = q % 3 == 0 ? 0 : u.Below(300);
    std::vector<int> expected;
    for (int id = min_id; id < 300; ++id) {
      if (Mappable(mover, targets[id])) expected.push_back(id);
    }
    std::vector<int> found;
    index.Query(mover, &found, min_id);
    EXPECT_EQ(found, expected) << "query " << q;
    offered += static_cast<long>(found.size());
  }
  // Neither everything nor nothing: the screen selects.
  EXPECT_GT(offered, 60);
  EXPECT_LT(offered, 60 * 300 / 3);
}

TEST(BoxTree, QueryFindsExactlyThePointsInsideTheOpenBox) {
  Uniform u(5);
  const BoxTree::Coordinates half = {0.1, 0.2, 0.15, 0.3, 0.1, 0.25};
  BoxTree tree(half);
  std::vector<BoxTree::Coordinates> points;
  // 1000 points: the buffer and trees of several sizes all hold some, and compacted trees.
  for (int id = 0; id < 1000; ++id) {
    BoxTree::Coordinates x;
    for (double& c : x) c = u.Next();
    points.push_back(x);
    tree.Insert(id, x);
    if (id % 211 == 100) tree.Compact();  // queries see the same points before and after
    if (id % 97 != 0 && id % 211 != 100) continue;
    for (int q = 0; q < 20; ++q) {
      BoxTree::Coordinates centre;
      for (double& c : centre) c = u.Next();
      std::vector<int> expected, found;
      for (int p = 0; p <= id; ++p) {
        bool inside = true;
        for (int k = 0; k < 6; ++k) inside = inside && std::abs(points[p][k] - centre[k]) < half[k];
        if (inside) expected.push_back(p);
      }
      tree.Query(centre, half, &found);
      std::sort(found.begin(), found.end());
      EXPECT_EQ(found, expected);
    }
  }
  // A box around a stored point finds it; one just past its edge does not (open box).
  std::vector<int> found;
  BoxTree::Coordinates edge = points[500];
  tree.Query(edge, half, &found);
  EXPECT_NE(std::find(found.begin(), found.end(), 500), found.end());
  edge[0] += half[0];
  found.clear();
  tree.Query(edge, half, &found);
  EXPECT_EQ(std::find(found.begin(), found.end(), 500), found.end());
}

}  // namespace
}  // namespace nucleate::match
