#include "core/structure/neighbor_list.h"

#include <algorithm>
#include <cmath>
#include <random>
#include <tuple>

#include <gtest/gtest.h>

#include "core/common/error.h"
#include "tests/unit/structure/crystal_builders.h"

namespace nucleate::structure {
namespace {

using Key = std::tuple<std::size_t, std::size_t, int, int, int>;

Key KeyOf(const Neighbor& n) { return {n.i, n.j, n.image[0], n.image[1], n.image[2]}; }

// Every (i, j, image) within the cutoff, by looping over a proven-sufficient image range.
std::vector<std::pair<Key, double>> BruteForceNeighbors(const Crystal& c, double cutoff) {
  const int range = testing::ImagesNeeded(c.lattice, cutoff) + 1;
  std::vector<std::pair<Key, double>> out;
  for (std::size_t i = 0; i < c.size(); ++i) {
    for (std::size_t j = 0; j < c.size(); ++j) {
      for (int x = -range; x <= range; ++x) {
        for (int y = -range; y <= range; ++y) {
          for (int z = -range; z <= range; ++z) {
            if (i == j && x == 0 && y == 0 && z == 0) continue;
            const Eigen::Vector3d f = c.frac[j] + Eigen::Vector3d(x, y, z) - c.frac[i];
            const double d = (c.lattice.transpose() * f).norm();
            if (d <= cutoff) out.push_back({Key{i, j, x, y, z}, d});
          }
        }
      }
    }
  }
  std::sort(out.begin(), out.end());
  return out;
}

void ExpectSameAsBruteForce(const Crystal& c, double cutoff) {
  std::vector<Neighbor> list = NeighborList(c, cutoff);
  std::vector<std::pair<Key, double>> got;
  for (const Neighbor& n : list) got.push_back({KeyOf(n), n.distance});
  std::sort(got.begin(), got.end());
  const auto expected = BruteForceNeighbors(c, cutoff);
  ASSERT_EQ(got.size(), expected.size()) << "cutoff " << cutoff;
  for (std::size_t k = 0; k < got.size(); ++k) {
    ASSERT_EQ(got[k].first, expected[k].first);
    EXPECT_NEAR(got[k].second, expected[k].second, 1e-10);
  }
}

TEST(NeighborList, EqualsBruteForceForRandom200AtomCells) {
  std::mt19937_64 rng(2024);
  const Eigen::Matrix3d cells[] = {
      testing::Cubic(12.0),
      testing::SkewedLattice(10.0, 14.0, 9.0, 70, 110, 95),
      testing::SkewedLattice(6.0, 30.0, 12.0, 25, 150, 140),  // strongly skewed, unequal axes
  };
  for (const Eigen::Matrix3d& lattice : cells) {
    const Crystal c = testing::RandomCrystal(rng, lattice, 200);
    for (double cutoff : {2.5, 4.0}) ExpectSameAsBruteForce(c, cutoff);
  }
}

TEST(NeighborList, CutoffLongerThanTheCell) {
  // A tiny skewed cell: each atom sees many images of itself and of the other atom.
  std::mt19937_64 rng(9);
  const Crystal c = testing::RandomCrystal(rng, testing::SkewedLattice(1.5, 2.0, 1.8, 40, 130, 100), 2);
  ExpectSameAsBruteForce(c, 5.0);
  const Crystal one = testing::MakeCrystal(testing::Cubic(1.0), {1}, {{0.5, 0.5, 0.5}});
  // Simple cubic a = 1: 6 neighbours at 1, 12 at sqrt 2, 8 at sqrt 3 (Kittel, ch. 1).
  EXPECT_EQ(NeighborList(one, 1.0 + 1e-9).size(), 6u);
  EXPECT_EQ(NeighborList(one, std::sqrt(2.0) + 1e-9).size(), 18u);
  EXPECT_EQ(NeighborList(one, std::sqrt(3.0) + 1e-9).size(), 26u);
}

TEST(NeighborList, UnwrappedCoordinatesGiveConsistentImages) {
  Crystal c = testing::RockSalt(11, 17, 5.64);
  c.frac[3] += Eigen::Vector3d(2, -1, 0);  // same position, another image
  ExpectSameAsBruteForce(c, 4.5);
}

TEST(CoordinationNumbers, TextbookStructures) {
  // Coordination numbers of rock salt (6), fcc (12) and diamond (4): Kittel, ch. 1.
  const Crystal nacl = testing::RockSalt(11, 17, 5.64);
  for (int cn : CoordinationNumbers(nacl, 5.64 / 2 * 1.1)) EXPECT_EQ(cn, 6);
  Crystal cu = testing::RockSalt(29, 29, 3.615);
  cu.numbers.resize(4);
  cu.frac.resize(4);
  for (int cn : CoordinationNumbers(cu, 3.615 / std::sqrt(2.0) * 1.1)) EXPECT_EQ(cn, 12);
  // Si-Si 2.35 A vs 2 x 1.11 A covalent radii (Cordero 2008): within 1.2 of the sum.
  const Crystal si = testing::Diamond(14, 5.431);
  for (int cn : CovalentCoordinationNumbers(si, 1.2)) EXPECT_EQ(cn, 4);
  for (int cn : CovalentCoordinationNumbers(si, 1.0)) EXPECT_EQ(cn, 0);
}

TEST(NeighborList, ErrorsNameTheField) {
  const Crystal c = testing::RockSalt(11, 17, 5.64);
  for (double bad : {0.0, -1.0, double(NAN), double(INFINITY)}) {
    try {
      NeighborList(c, bad);
      FAIL() << bad;
    } catch (const Error& e) {
      EXPECT_EQ(e.field(), "cutoff");
    }
  }
  try {
    NeighborList(c, 1000.0);
    FAIL() << "no limit";
  } catch (const Error& e) {
    EXPECT_EQ(e.kind(), ErrorKind::kLimitExceeded);
    EXPECT_EQ(e.field(), "cutoff");
  }
  try {
    CovalentCoordinationNumbers(c, NAN);
    FAIL();
  } catch (const Error& e) {
    EXPECT_EQ(e.field(), "factor");
  }
  Crystal heavy = c;
  heavy.numbers[5] = 100;  // Fm: Cordero 2008 stops at Cm (96)
  try {
    CovalentCoordinationNumbers(heavy, 1.2);
    FAIL();
  } catch (const Error& e) {
    EXPECT_EQ(e.field(), "atomic_numbers[5]");
  }
}

}  // namespace
}  // namespace nucleate::structure
