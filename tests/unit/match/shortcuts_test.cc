// The shortcuts dedup takes for speed, each against the plain computation it replaces: they must
// give the same verdicts, not just usually. Inputs sit on or near every edge a shortcut has
// (rounding ties, angle windows, the reach of the site search), so a shortcut that only
// approximates would show.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <limits>
#include <vector>

#include "core/match/anchor_screen.h"
#include "core/match/lattice_index.h"
#include "core/match/lattice_mapping.h"
#include "core/match/lattice_points.h"
#include "core/match/prepared_crystal.h"
#include "core/match/short_image.h"
#include "core/match/site_assignment.h"
#include "core/match/structure_matcher.h"
#include "core/structure/lattice.h"
#include "tests/unit/match/dedup_workload.h"
#include "tests/unit/match/match_support.h"

namespace nucleate::match {
namespace {

using symmetry::testing::Uniform;

TEST(WrappedFraction, IsXMinusStdRoundBitForBit) {
  std::vector<double> xs = {0.0, -0.0, 0.5, -0.5, 1.5, -1.5, 2.5, -2.5, 0.49999999999999994,
                            -0.49999999999999994, 1 - 1e-16, -(1 - 1e-16), 0x1p52, -0x1p52,
                            0x1p52 + 1, 0x1p53, 1e300, -1e300,
                            -3.0, 4.0, std::numeric_limits<double>::infinity(),
                            std::numeric_limits<double>::denorm_min(),
                            -std::numeric_limits<double>::denorm_min()};
  Uniform u(3);
  for (int k = 0; k < 100000; ++k) {
    const double x = (u.Next() - 0.5) * std::pow(2.0, static_cast<int>(u.Below(12)));
    xs.push_back(x);
    xs.push_back(std::nextafter(std::floor(x) + 0.5, 0.0));
    xs.push_back(std::floor(x) + 0.5);
  }
  for (double x : xs) {
    const double expected = x - std::round(x), got = WrappedFraction(x);
    if (std::isnan(expected)) {
      EXPECT_TRUE(std::isnan(got)) << x;
      continue;
    }
    EXPECT_EQ(got, expected) << x;
    EXPECT_EQ(std::signbit(got), std::signbit(expected)) << x;
  }
}

// ShortImage as it was before its bounds: all 27 images computed and compared, in order.
struct PlainImage {
  Eigen::Matrix3d lattice;
  Eigen::Vector3d Base(const Eigen::Vector3d& delta) const {
    return lattice.transpose() * (delta - delta.array().round().matrix());
  }
  Eigen::Vector3d Vector(const Eigen::Vector3d& delta) const {
    const Eigen::Vector3d base = Base(delta);
    Eigen::Vector3d best = base;
    double best2 = std::numeric_limits<double>::infinity();
    for (int i = -1; i <= 1; ++i)
      for (int j = -1; j <= 1; ++j)
        for (int l = -1; l <= 1; ++l) {
          const Eigen::Vector3d v = base + lattice.transpose() * Eigen::Vector3d(i, j, l);
          if (v.squaredNorm() < best2) {
            best2 = v.squaredNorm();
            best = v;
          }
        }
    return best;
  }
};

// The bounds that let ShortImage skip images must never change a result: Vector bit for bit and
// Within's verdict against the plain search over all 27 images, on reduced and skewed cells,
// with deltas on exact half-cell ties (where several images are equally short) and limits at and
// around the actual shortest length.
TEST(ShortImage, BoundsChangeNoResult) {
  Uniform u(8);
  int inside = 0, outside = 0;
  for (int cell = 0; cell < 300; ++cell) {
    structure::LatticeParameters p{1 + 2 * u.Next(), 1 + 2 * u.Next(), 1 + 2 * u.Next(),
                                   60 + 60 * u.Next(), 60 + 60 * u.Next(), 60 + 60 * u.Next()};
    Eigen::Matrix3d l;
    try {
      l = structure::MatrixFromParameters(p);
    } catch (...) {
      continue;
    }
    if (cell % 3 == 0) l = ShortestBasis(l);
    if (cell % 5 == 0) l = Eigen::Matrix3d::Identity() * (1 + u.Next());  // many exact ties
    const ShortImage image(l);
    const PlainImage plain{l};
    for (int k = 0; k < 400; ++k) {
      Eigen::Vector3d delta(4 * u.Next() - 2, 4 * u.Next() - 2, 4 * u.Next() - 2);
      if (k % 4 == 0) delta = Eigen::Vector3d(0.5 * u.Below(5), 0.5 * u.Below(5), 0.25 * u.Below(9)) -
                              Eigen::Vector3d(1, 1, 1);
      const Eigen::Vector3d expected = plain.Vector(delta), got = image.Vector(delta);
      for (int a = 0; a < 3; ++a) {
        EXPECT_EQ(got[a], expected[a]) << cell << " " << k;
        EXPECT_EQ(std::signbit(got[a]), std::signbit(expected[a])) << cell << " " << k;
      }
      const double d2 = expected.squaredNorm();
      for (double limit2 : {d2, std::nextafter(d2, 10.0), d2 * (1 + 1e-12), d2 * 0.999, d2 * 1.5,
                            4 * u.Next(), 0.05 * u.Next()}) {
        const bool verdict = d2 < limit2;
        EXPECT_EQ(image.Within(delta, limit2), verdict) << cell << " " << k;
        (verdict ? inside : outside)++;
      }
    }
  }
  EXPECT_GT(inside, 10000);
  EXPECT_GT(outside, 10000);
}

// CosineWindow must hold every cosine whose AngleDegrees falls in the window, including cosines
// a few ulps from the edges, beyond +-1 (clamped) and windows reaching past 0 or 180 degrees.
TEST(CosineWindow, NeverRejectsAnAngleInsideTheWindow) {
  Uniform u(12);
  const Eigen::Vector3d x(1, 0, 0);
  int checked = 0;
  for (int k = 0; k < 20000; ++k) {
    const double centre = 190 * u.Next() - 5, half = 10 * u.Next();
    double lo, hi;
    CosineWindow(centre - half, centre + half, &lo, &hi);
    for (double edge : {centre - half, centre + half}) {
      const double c0 = std::cos(edge / 57.29577951308232);
      double c = c0;
      for (int step = 0; step < 8; ++step, c = std::nextafter(c, 2.0)) {
        for (double cosine : {c, std::nextafter(c0, -2.0 + step), 1.0 + 1e-16 * step,
                              -1.0 - 1e-16 * step}) {
          // The angle AngleDegrees gives for this cosine (unit vectors, so it is the cosine).
          const Eigen::Vector3d y(cosine, 0, 0);
          const double degrees = AngleDegrees(x, y, 1.0, 1.0);
          if (std::abs(degrees - centre) < half) {
            EXPECT_TRUE(cosine > lo && cosine < hi) << centre << " " << half << " " << cosine;
            ++checked;
          }
        }
      }
    }
  }
  EXPECT_GT(checked, 10000);
}

// The bases a LatticeIndex query lists with a target, filtered by MappingTest and taken with
// both signs, are exactly the mappings FindLatticeMappings finds for that pair, basis rows
// included bit for bit: what lets MatchesUnderBases skip the lattice search.
TEST(LatticeIndex, HitsHoldExactlyTheMappingsUpToSign) {
  constexpr double kLtol = 0.2, kAngle = 5.0;
  Uniform u(61);
  const auto cell = [&](double strain, const Eigen::Matrix3d& base) {
    Eigen::Matrix3d e;
    for (int i = 0; i < 3; ++i)
      for (int j = 0; j < 3; ++j) e(i, j) = strain * (2 * u.Next() - 1);
    e = (e + e.transpose()) / 2;
    Eigen::Matrix3d l = base * (Eigen::Matrix3d::Identity() + e).transpose() *
                        testing::RandomRotation(u).transpose();
    l *= std::cbrt(20 / std::abs(l.determinant()));
    return ShortestBasis(l);
  };
  std::vector<Eigen::Matrix3d> bases;
  for (int k = 0; k < 3; ++k) {
    structure::LatticeParameters p{1 + u.Next(), 1 + u.Next(), 1 + u.Next(),
                                   70 + 40 * u.Next(), 70 + 40 * u.Next(), 70 + 40 * u.Next()};
    bases.push_back(structure::MatrixFromParameters(p));
  }
  bases.push_back(Eigen::Matrix3d::Identity());  // cubic: many mappings per pair
  std::vector<Eigen::Matrix3d> targets;
  LatticeIndex index(kLtol, kAngle);
  for (int id = 0; id < 200; ++id) {
    targets.push_back(cell(0.15, bases[u.Below(4)]));
    index.Insert(id, targets.back());
  }
  using Key = std::vector<double>;
  const auto key = [](const LatticeMapping& m) {
    Key k;
    for (int i = 0; i < 9; ++i) k.push_back(m.coefficients(i / 3, i % 3));
    for (int i = 0; i < 9; ++i) k.push_back(m.basis(i / 3, i % 3));
    return k;
  };
  long mappings = 0;
  for (int q = 0; q < 40; ++q) {
    const Eigen::Matrix3d mover = cell(0.15, bases[u.Below(4)]);
    LatticeHits hits;
    index.Query(mover, &hits);
    ASSERT_TRUE(hits.bases_known);
    for (int id = 0; id < 200; ++id) {
      std::vector<Key> expected, found;
      for (const auto& m : FindLatticeMappings(mover, targets[id], kLtol, kAngle, 1)) {
        expected.push_back(key(m));
      }
      const MappingTest test(targets[id], kLtol, kAngle);
      for (const auto& [target, basis] : hits.hits) {
        if (target != id || !test.Accepts(hits.bases[basis])) continue;
        const LatticeMapping& m = hits.bases[basis].mapping;
        found.push_back(key(m));
        found.push_back(key({-m.coefficients, -m.basis}));
      }
      std::sort(expected.begin(), expected.end());
      std::sort(found.begin(), found.end());
      EXPECT_EQ(found, expected) << "query " << q << " target " << id;
      mappings += static_cast<long>(expected.size());
    }
  }
  EXPECT_GT(mappings, 2000);
}

// The exact tests the anchor screen stands in for, computed the matcher's way (AverageLattice,
// ShortImage, mapped sites wrapped): under mapping m, the
// trial origin that puts the target's anchor site on mover site `origin` passes when every block
// has partners within reach (AssignSites' first step).
bool ExactOriginPasses(const PreparedCrystal& mover, const PreparedCrystal& target,
                       const LatticeMapping& m, int origin, double stol) {
  const Eigen::Matrix3d average =
      AverageLattice(m.basis, structure::ParametersFromMatrix(target.lattice));
  const double unit =
      std::cbrt(std::abs(average.determinant()) / static_cast<double>(target.size()));
  const double reach = 2 * stol * unit;
  const ShortImage image(average);
  const Eigen::Matrix3d inverse_t = m.coefficients.cast<double>().inverse().transpose();
  std::vector<Eigen::Vector3d> mapped;
  for (const auto& f : mover.frac) mapped.push_back(structure::WrapFractional(inverse_t * f));
  const auto anchor = target.blocks[AnchorBlock(target)];
  const Eigen::Vector3d shift = mapped[anchor.first + origin] - target.frac[anchor.first];
  for (const auto& block : target.blocks) {
    if (!BlockHasPartners(mapped, target.frac, block, shift, image, reach * reach)) return false;
  }
  return true;
}

// The anchor screen never rules out a trial origin the exact tests accept, under a mapping and
// under its mirror image, on lattice-compatible pairs of the dedup workload (variants of one
// prototype pass, others not) and on random cells at site tolerances up to where the screen
// steps aside; and it rules out most of the others.
TEST(AnchorScreen, NeverRejectsAnOriginTheExactTestsAccept) {
  Uniform u(17);
  std::vector<std::pair<PreparedCrystal, PreparedCrystal>> pairs;
  std::vector<double> tolerances;
  const auto workload = testing::DedupWorkload(11).Make(120);
  MatchTolerances tol;
  for (std::size_t i = 0; i < workload.size(); ++i) {
    for (std::size_t j = i % 2; j < workload.size(); j += 2) {
      pairs.emplace_back(Prepare(workload[i], tol), Prepare(workload[j], tol));
      tolerances.push_back(0.3);
    }
  }
  // Random cells, each against a strained, shaken copy of itself, at larger site tolerances.
  for (int k = 0; k < 60; ++k) {
    const auto c = testing::RandomCrystal({8, 8, 8, 8, 8, 8, 22, 22, 22, 56, 56}, u, 12.0);
    Eigen::Matrix3d e;
    for (int a = 0; a < 3; ++a)
      for (int b = 0; b < 3; ++b) e(a, b) = 0.05 * (u.Next() - 0.5);
    auto d = testing::Strain(c, (e + e.transpose()) / 2);
    for (auto& f : d.frac) f += 0.04 * Eigen::Vector3d(u.Next() - 0.5, u.Next() - 0.5, u.Next() - 0.5);
    pairs.emplace_back(Prepare(d, tol), Prepare(c, tol));
    tolerances.push_back(0.3 + 0.5 * u.Next());
  }
  long tried = 0, accepted = 0, screened_out = 0, stepped_aside = 0, mappings = 0;
  for (std::size_t k = 0; k < pairs.size(); ++k) {
    const auto& [mover, target] = pairs[k];
    const double stol = tolerances[k];
    const AnchorTarget record = AnchorTargetOf(target);
    const int sites = record.sites[0];
    ASSERT_GT(sites, 0);
    for (const auto& m : FindLatticeMappings(mover.lattice, target.lattice, tol.length_tolerance,
                                             tol.angle_tolerance, 1)) {
      AnchorMover side;
      SetAnchorMover(mover, ScreenedBlocksOf(mover), m.coefficients, m.basis, &side);
      const AnchorShifts shifts = AnchorShiftsThatMayPass(side, record, stol);
      ++mappings;
      if (shifts.plus == ~std::uint64_t{0}) ++stepped_aside;
      // The negation of the mapping, built as MatchesUnderBases builds it. SearchSites takes its
      // origins from the mapping's `minus` rather than screening it again: the two must agree.
      const LatticeMapping mirror{-m.coefficients, -m.basis};
      AnchorMover mirror_side;
      SetAnchorMover(mover, ScreenedBlocksOf(mover), mirror.coefficients, mirror.basis,
                     &mirror_side);
      ASSERT_EQ(AnchorShiftsThatMayPass(mirror_side, record, stol).plus, shifts.minus);
      for (int o = 0; o < sites; ++o) {
        for (const auto& [mapping, mask] : {std::make_pair(m, shifts.plus),
                                            std::make_pair(mirror, shifts.minus)}) {
          const bool exact = ExactOriginPasses(mover, target, mapping, o, stol);
          const bool screen = (mask >> o) & 1;
          ++tried;
          accepted += exact;
          screened_out += !screen;
          EXPECT_TRUE(screen || !exact) << "pair " << k << " origin " << o;
        }
      }
    }
  }
  // Origins the exact tests accept are present in bulk, the screen rules out nearly all the
  // rest, and both of its regimes are exercised: applying, and stepping aside (large tolerances).
  EXPECT_GT(accepted, 1000);
  EXPECT_GT(screened_out, 0.9 * static_cast<double>(tried - accepted));
  EXPECT_GT(stepped_aside, 10);
  EXPECT_LT(stepped_aside, mappings / 4);
}

// MatchesUnderBases gives MatchPrepared's verdict on the pairs dedup matches (the benchmark's
// workload: lattice-compatible pairs, both matching and not).
TEST(MatchesUnderBases, GivesMatchPreparedsVerdict) {
  const MatchTolerances tol;
  const auto structures = testing::DedupWorkload(5).Make(300);
  std::vector<PreparedCrystal> prepared;
  LatticeIndex index(tol.length_tolerance, tol.angle_tolerance);
  for (std::size_t i = 0; i < structures.size(); ++i) {
    prepared.push_back(Prepare(structures[i], tol));
    index.Insert(static_cast<int>(i), prepared.back().lattice);
  }
  int matches = 0, pairs = 0;
  MatcherWorkspace scratch;
  for (std::size_t i = 0; i < prepared.size(); ++i) {
    LatticeHits hits;
    index.Query(prepared[i].lattice, &hits);
    for (std::size_t h = 0; h < hits.hits.size();) {
      const int j = hits.hits[h].first;
      std::vector<const CandidateBasis*> bases;
      for (; h < hits.hits.size() && hits.hits[h].first == j; ++h) {
        bases.push_back(&hits.bases[hits.hits[h].second]);
      }
      const bool expected = MatchPrepared(prepared[i], prepared[j], tol, true).match;
      EXPECT_EQ(MatchesUnderBases(prepared[i], prepared[j], tol, ShapeOf(prepared[j], tol), bases,
                                  &scratch),
                expected)
          << i << " " << j;
      matches += expected;
      ++pairs;
    }
  }
  EXPECT_GT(matches, 300);          // every structure matches itself, and duplicates
  EXPECT_GT(pairs - matches, 3000);  // and many lattice-compatible pairs do not match
}

}  // namespace
}  // namespace nucleate::match
