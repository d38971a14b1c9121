#include "core/match/anchor_screen.h"

#include <algorithm>
#include <cmath>
#include <limits>

namespace nucleate::match {
namespace {

constexpr std::uint64_t kAll = ~std::uint64_t{0};

// Four sites at a time (two SSE2 registers per array), padded with NaN, which no test passes.
using Lanes = Eigen::Array<double, 4, 1>;
constexpr int kLaneGroups = (kMaxAnchorSites + 3) / 4;

// x minus the nearest integer, for |x| < 2^51: adding and subtracting 1.5 * 2^52 rounds x to an
// integer (ties to even, where the screen has already stepped aside: see the reach bound).
// Branch-free.
Lanes Wrapped(const Lanes& x) {
  constexpr double kMagic = 6755399441055744.0;
  return x - ((x + kMagic) - kMagic);
}

// The averaged cell's metric (g00, g11, g22, 2 g12, 2 g02, 2 g01) and the bound the quadratic
// form of a difference must meet, as its cube: (w^T G w)^3 <= limit6.
struct Measure {
  double metric[6];
  double limit6;
};

// One screened block under one handedness, packed into lanes.
struct Block {
  int sites = 0, groups = 0;
  Lanes site[kLaneGroups][3];
};

void Pack(const AnchorMover& mover, int b, double sign, Block* out) {
  out->sites = mover.sites[b];
  out->groups = (out->sites + 3) / 4;
  for (int g = 0; g < out->groups; ++g) {
    for (int k = 0; k < 3; ++k) {
      for (int lane = 0; lane < 4; ++lane) {
        const int i = 4 * g + lane;
        out->site[g][k][lane] = i < out->sites ? sign * mover.site[b][k][i]
                                               : std::numeric_limits<double>::quiet_NaN();
      }
    }
  }
}

// Whether some site of `block` lies within reach of point c (all sites at once, no branch on the
// random outcomes).
bool AnySiteNear(const Block& block, double c0, double c1, double c2, const Measure& m) {
  bool found = false;
  for (int g = 0; g < block.groups; ++g) {
    const Lanes w0 = Wrapped(block.site[g][0] - c0), w1 = Wrapped(block.site[g][1] - c1),
                w2 = Wrapped(block.site[g][2] - c2);
    const Lanes q = m.metric[0] * w0 * w0 + m.metric[1] * w1 * w1 + m.metric[2] * w2 * w2 +
                    m.metric[3] * w1 * w2 + m.metric[4] * w0 * w2 + m.metric[5] * w0 * w1;
    found = found || (q * q * q <= m.limit6).any();
  }
  return found;
}

// The trial origins of one handedness: sign +1 for the mapping, -1 for its negation (the mover's
// mapped sites negated). Under origin o a target site with offset e from t_0 sits at
// mover_o + e, and some mover site of its block must lie within reach of it.
std::uint64_t ShiftsOfOneHand(const AnchorMover& mover, const AnchorTarget& target, double sign,
                              const Measure& m) {
  Block anchor, second;
  Pack(mover, 0, sign, &anchor);
  if (target.sites[1] > 0) Pack(mover, 1, sign, &second);
  const int n0 = target.sites[0];
  const double* const second_offsets = target.offset[n0 - 1];
  std::uint64_t pass = 0;
  for (int origin = 0; origin < n0; ++origin) {
    const double o0 = sign * mover.site[0][0][origin], o1 = sign * mover.site[0][1][origin],
                 o2 = sign * mover.site[0][2][origin];
    bool ok = true;
    for (int j = n0 - 2; j >= 0 && ok; --j) {
      ok = AnySiteNear(anchor, o0 + target.offset[j][0], o1 + target.offset[j][1],
                       o2 + target.offset[j][2], m);
    }
    for (int j = 0; j < target.sites[1] && ok; ++j) {
      const double* e = second_offsets + 3 * j;
      ok = AnySiteNear(second, o0 + e[0], o1 + e[1], o2 + e[2], m);
    }
    if (ok) pass |= std::uint64_t{1} << origin;
  }
  return pass;
}

}  // namespace

std::size_t AnchorBlock(const PreparedCrystal& c) {
  std::size_t anchor = 0;
  const auto size = [&](std::size_t q) { return c.blocks[q].second - c.blocks[q].first; };
  for (std::size_t k = 1; k < c.blocks.size(); ++k) {
    if (size(k) < size(anchor)) anchor = k;
  }
  return anchor;
}

ScreenedBlocks ScreenedBlocksOf(const PreparedCrystal& c) {
  ScreenedBlocks screened;
  if (c.blocks.empty()) return screened;
  int* const blocks = screened.block;
  const auto size = [&](std::size_t q) { return c.blocks[q].second - c.blocks[q].first; };
  const std::size_t anchor = AnchorBlock(c);
  blocks[0] = static_cast<int>(anchor);
  for (std::size_t k = 0; k < c.blocks.size(); ++k) {
    if (k != anchor && (blocks[1] < 0 || size(k) < size(blocks[1]))) blocks[1] = static_cast<int>(k);
  }
  if (size(anchor) > kMaxAnchorSites) blocks[0] = -1;
  if (blocks[0] < 0 || (blocks[1] >= 0 && size(blocks[1]) > kMaxAnchorSites)) blocks[1] = -1;
  return screened;
}

CellShape CellShapeOf(const Eigen::Matrix3d& rows) {
  CellShape s;
  for (int k = 0; k < 3; ++k) s.length[k] = rows.row(k).norm();
  static const int kPair[3][2] = {{1, 2}, {0, 2}, {0, 1}};
  for (int k = 0; k < 3; ++k) {
    const int x = kPair[k][0], y = kPair[k][1];
    const double c =
        std::clamp(rows.row(x).dot(rows.row(y)) / (s.length[x] * s.length[y]), -1.0, 1.0);
    s.cosine[k] = c;
    s.sine[k] = std::sqrt(1 - c * c);
  }
  return s;
}

AnchorTarget AnchorTargetOf(const PreparedCrystal& target) {
  AnchorTarget t;
  t.cell = CellShapeOf(target.lattice);
  t.atoms = static_cast<int>(target.size());
  const ScreenedBlocks screened = ScreenedBlocksOf(target);
  const int* const blocks = screened.block;
  if (blocks[0] < 0) return t;
  const auto [begin, end] = target.blocks[blocks[0]];
  const Eigen::Vector3d& t0 = target.frac[begin];
  int row = 0;
  for (int s = begin + 1; s < end; ++s, ++row) {
    for (int k = 0; k < 3; ++k) t.offset[row][k] = target.frac[s][k] - t0[k];
  }
  t.sites[0] = end - begin;
  if (blocks[1] >= 0) {
    const auto [first, last] = target.blocks[blocks[1]];
    for (int s = first; s < last; ++s, ++row) {
      for (int k = 0; k < 3; ++k) t.offset[row][k] = target.frac[s][k] - t0[k];
    }
    t.sites[1] = last - first;
  }
  return t;
}

void SetAnchorMover(const PreparedCrystal& mover, const ScreenedBlocks& screened,
                    const Eigen::Matrix3i& coefficients, const Eigen::Matrix3d& basis,
                    AnchorMover* out) {
  out->cell = CellShapeOf(basis);
  out->sites[0] = out->sites[1] = 0;
  const int* const blocks = screened.block;
  if (blocks[0] < 0) return;
  // Rows: basis = coefficients * lattice, so fractions in the new basis are coefficients^-T f.
  const Eigen::Matrix3d inverse_t = coefficients.cast<double>().inverse().transpose();
  for (int b = 0; b < 2; ++b) {
    if (blocks[b] < 0) continue;
    const auto [begin, end] = mover.blocks[blocks[b]];
    out->sites[b] = end - begin;
    for (int i = 0; i < end - begin; ++i) {
      const Eigen::Vector3d x = inverse_t * mover.frac[begin + i];
      for (int k = 0; k < 3; ++k) out->site[b][k][i] = x[k];
    }
  }
}

AnchorShifts AnchorShiftsThatMayPass(const AnchorMover& mover, const AnchorTarget& target,
                                     double site_tolerance) {
  const AnchorShifts all{kAll, kAll};
  if (target.sites[0] == 0 || mover.sites[0] != target.sites[0] ||
      mover.sites[1] != target.sites[1]) {
    return all;
  }
  // The averaged cell: mean lengths, and the cosine and sine of each mean angle from
  // cos((x + y) / 2) = (cos x + cos y) / (2 cos((x - y) / 2)) (likewise the sine), where
  // cos((x - y) / 2) = sqrt((1 + cos x cos y + sin x sin y) / 2) is near 1 for close angles.
  const CellShape& p = mover.cell;
  const CellShape& q = target.cell;
  double length[3], cosine[3], sine[3];
  for (int k = 0; k < 3; ++k) {
    length[k] = (p.length[k] + q.length[k]) / 2;
    const double half = std::sqrt((1 + p.cosine[k] * q.cosine[k] + p.sine[k] * q.sine[k]) / 2);
    const double scale = 1 / (2 * half);
    cosine[k] = (p.cosine[k] + q.cosine[k]) * scale;
    sine[k] = (p.sine[k] + q.sine[k]) * scale;
  }
  // s^2 = (V / (abc))^2. A nearly flat averaged cell is left to the exact test (its quadratic
  // form would lose digits to cancellation).
  const double s2 = 1 - cosine[0] * cosine[0] - cosine[1] * cosine[1] - cosine[2] * cosine[2] +
                    2 * cosine[0] * cosine[1] * cosine[2];
  if (!(s2 > 1e-3)) return all;
  // reach = 2 stol (V / N)^(1/3); its sixth power, 64 stol^6 (V / N)^2, needs no root.
  const double abc = length[0] * length[1] * length[2];
  const double stol2 = site_tolerance * site_tolerance;
  const double reach6 = 64 * stol2 * stol2 * stol2 * abc * abc * s2 /
                        (static_cast<double>(target.atoms) * target.atoms);
  const double widen = 1 + 1e-4;
  Measure m;
  m.limit6 = reach6 * widen * widen * widen;
  // reach |r_k| = reach sin(angle_k) / (length_k s) below 1/2 (less 1e-6) on every axis, in sixth
  // powers and without division: limit6 sin^6 < (1/2 - 1e-6)^6 (length^2 s^2)^3.
  constexpr double kHalf = 0.5 - 1e-6;
  constexpr double kHalf6 = kHalf * kHalf * kHalf * kHalf * kHalf * kHalf;
  for (int k = 0; k < 3; ++k) {
    const double sin2 = sine[k] * sine[k], span2 = length[k] * length[k] * s2;
    if (m.limit6 * sin2 * sin2 * sin2 >= kHalf6 * span2 * span2 * span2) return all;
  }
  m.metric[0] = length[0] * length[0];
  m.metric[1] = length[1] * length[1];
  m.metric[2] = length[2] * length[2];
  m.metric[3] = 2 * length[1] * length[2] * cosine[0];
  m.metric[4] = 2 * length[0] * length[2] * cosine[1];
  m.metric[5] = 2 * length[0] * length[1] * cosine[2];
  return {ShiftsOfOneHand(mover, target, 1, m), ShiftsOfOneHand(mover, target, -1, m)};
}

}  // namespace nucleate::match
