// A cheap necessary condition for the matcher's first tests under one lattice mapping (SearchSites
// in structure_matcher.cc). A trial origin puts the target's anchor site (the first of its least
// frequent element) on mover site o of that element; AssignSites then rejects the origin unless
// every target site of each element has a mover site of that element within reach =
// 2 stol (V/N)^(1/3), measured in the averaged cell (BlockHasPartners). About 99 % of all mappings
// and origins end there, in the anchor's block or the next smallest.
//
// The exact test needs the averaged cell, built with trigonometry, and the target's sites. This
// screen applies it to those two blocks ("screened blocks") with neither: the averaged cell's
// metric and volume follow from its lengths and from the cosines and sines of its angles, which
// the half-angle identities give from those of the two cells; and while reach |r_k| (r_k the
// reciprocal rows) stays below 1/2 on every axis, the only image of a wrapped difference that can
// be shorter than reach is the wrapped difference itself, so one quadratic form decides. The
// target side is a small record per structure (AnchorTarget, kept in the target's TargetShape),
// the mover side one per lattice mapping (AnchorMover), so dedup screens a pair without touching
// the target's sites.
//
// Every bound is widened (relative 1e-4 on reach^2), far above the rounding of this arithmetic and
// of the exact test's, so an origin the exact test accepts is never screened out: the matcher's
// verdict, rms and largest displacement are those it gives without the screen
// (tests/unit/match/anchor_screen_test.cc checks this on random pairs).
#pragma once

#include <cstddef>
#include <cstdint>

#include <Eigen/Dense>

#include "core/match/prepared_crystal.h"

namespace nucleate::match {

// Screened blocks larger than this are left out (the screen is for the usual few sites of the
// least frequent elements); an anchor block larger than this turns the screen off.
constexpr int kMaxAnchorSites = 8;

// The block of the least frequent element (the first such in Z order): the matcher's anchor.
std::size_t AnchorBlock(const PreparedCrystal& crystal);

// The screened blocks of a crystal: the anchor's and the smallest other (the first such), -1
// where left out (no such block, or one too large). The same for every structure of one formula
// and site count; computed once per structure rather than once per lattice mapping.
struct ScreenedBlocks {
  int block[2] = {-1, -1};
};
ScreenedBlocks ScreenedBlocksOf(const PreparedCrystal& crystal);

// A cell's lengths and the cosines and sines of alpha (rows 1, 2), beta (0, 2), gamma (0, 1).
struct CellShape {
  double length[3];
  double cosine[3], sine[3];
};
CellShape CellShapeOf(const Eigen::Matrix3d& rows);

// The target side: its prepared cell, its site count, and the sites of the screened blocks
// relative to the anchor site t_0: first the anchor block's other sites, then the second block's.
struct AnchorTarget {
  CellShape cell;
  int atoms = 0;
  int sites[2] = {0, 0};  // per screened block; sites[0] = 0: not screened
  double offset[2 * kMaxAnchorSites - 1][3];
};
AnchorTarget AnchorTargetOf(const PreparedCrystal& target);

// The mover side under one lattice mapping (rows of `coefficients` in the mover's prepared
// lattice give `basis`, index 1): the mapped cell and the mover's sites of the screened blocks in
// it, per block and axis, not wrapped (only differences are used). `screened` =
// ScreenedBlocksOf(mover).
struct AnchorMover {
  CellShape cell;
  int sites[2] = {0, 0};
  double site[2][3][kMaxAnchorSites];
};
void SetAnchorMover(const PreparedCrystal& mover, const ScreenedBlocks& screened,
                    const Eigen::Matrix3i& coefficients, const Eigen::Matrix3d& basis,
                    AnchorMover* out);

// Trial origins that may pass the exact tests: bit o set for each mover anchor site o (counted
// from the block's first) whose origin may pass under the mapping (plus) and under its negation
// (minus, the mirror image). All bits set when the screen does not apply (different or too large
// blocks, a cell too small or too flat for the bounds above).
struct AnchorShifts {
  std::uint64_t plus = 0, minus = 0;
};
AnchorShifts AnchorShiftsThatMayPass(const AnchorMover& mover, const AnchorTarget& target,
                                     double site_tolerance);

}  // namespace nucleate::match
