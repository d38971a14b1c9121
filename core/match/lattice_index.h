// An exact lattice screen for dedup: which stored target lattices admit at least one lattice
// mapping (lattice_mapping.h) from a query lattice. A pair it rejects is a pair the matcher
// rejects, so the screen can never drop a true match; it replaces binning by continuous
// invariants, whose widths could only be argued (not proven) to cover the tolerances.
//
// Why it is exact: the matcher accepts a pair only if some basis v of the mover's lattice has
//   |ln|v_k| - ln|t_k|| < ln(1 + length_tolerance)   and   |angle_ij(v) - angle_ij(t)| < angle_tol
// for the target's prepared basis t (its shortest basis, fixed per target). Each target is stored
// as the point (ln|t_1|, ln|t_2|, ln|t_3|, alpha, beta, gamma). A query enumerates every basis v of
// the mover that could satisfy this for ANY stored t: each |v_k| < (1 + ltol) max|t_k| bounds the
// lattice-vector search radius, and the per-slot length ranges, angle ranges and length order of
// the stored points (widened by the tolerances) prune the enumeration. Each such v is then a box query
// (exactly the two inequalities above) on a k-d tree of the stored points (box_tree.h). Nothing is approximated:
// the ranges are those of the data actually stored, and every comparison carries a tiny slack in
// the accepting direction so rounding cannot reject what the matcher's own arithmetic accepts.
// Negating all three vectors of v changes no length or angle, so only one of each such pair is
// enumerated.
//
// A query also reports which enumerated bases reached each target (LatticeHits): they include,
// up to sign, every lattice mapping the matcher would find for the pair, so dedup hands them to
// the matcher (MatchesUnderBases, structure_matcher.h) instead of searching the lattice again per
// pair.
//
// Cost: one enumeration per query (independent of the number of stored lattices) plus one box
// query per enumerated basis (about a hundred for 20-atom cells of one composition). In the
// enumeration, the tests that involve only two of the three vectors are made once per pair of
// vectors, and angles are first screened by their cosines (CosineWindow), so most acos calls are
// skipped.
#pragma once

#include <vector>

#include <Eigen/Dense>

#include "core/match/box_tree.h"
#include "core/match/lattice_mapping.h"
#include "core/match/lattice_points.h"

namespace nucleate::match {

// What one query found: the bases of the mover it enumerated and, per stored target, which of them
// reach it. Of every pair of bases v, -v (same lengths and angles) only the one whose first row's
// first non-zero coefficient is positive is enumerated.
struct LatticeHits {
  std::vector<CandidateBasis> bases;
  // (target id, index into `bases`), ascending, without repeats. For every target, the bases listed
  // with it include, up to sign, every mapping FindLatticeMappings(mover, target, ltol, angle_tol,
  // 1) returns; a listed basis may still fail MappingTest by up to the rounding slack.
  std::vector<std::pair<int, int>> hits;
  // False when the enumeration was refused (too many lattice points): then every stored id >=
  // min_id is listed with basis -1, and the matcher must search the lattice itself.
  bool bases_known = true;

  // The query's own buffers, kept with its result so that repeated queries do not allocate.
  struct Scratch {
    std::vector<LatticePoint> points;
    std::vector<double> log_length, beta;
    std::vector<int> slot[3], found;
    std::vector<std::pair<std::size_t, double>> thirds;
    std::vector<std::pair<std::size_t, std::size_t>> with_b;
    std::vector<char> with_b_done, beta_done;
  } scratch;
};

class LatticeIndex {
 public:
  LatticeIndex(double length_tolerance, double angle_tolerance);

  // `lattice`: rows = the target's prepared basis (PreparedCrystal::lattice). Not thread-safe
  // against concurrent queries.
  void Insert(int id, const Eigen::Matrix3d& lattice);

  // BoxTree::Compact: the same results, found faster. Not thread-safe against concurrent queries.
  void Compact() { tree_.Compact(); }

  // Fills *out (cleared first) with every stored id >= min_id for which FindLatticeMappings(mover,
  // target, ltol, angle_tol, 1) is not empty, each with the bases that reach it (see LatticeHits).
  // Read-only: safe from many threads while no Insert runs.
  void Query(const Eigen::Matrix3d& mover, LatticeHits* out, int min_id = 0) const;

  // The same, ids only: appended to *out ascending and without repeats (the caller clears *out).
  void Query(const Eigen::Matrix3d& mover, std::vector<int>* out, int min_id = 0) const;

  bool empty() const { return ids_.empty(); }

 private:
  // Points: ln lengths of rows 0..2, then angles alpha (1,2), beta (0,2), gamma (0,1), degrees.
  BoxTree tree_;
  std::vector<int> ids_;            // every stored id, ascending
  BoxTree::Coordinates half_width_;  // the tolerance per coordinate, plus rounding slack
  // Ranges of the stored coordinates, and the largest ln|t_0| - ln|t_1|, ln|t_1| - ln|t_2|,
  // ln|t_0| - ln|t_2| (<= 0 for shortest bases, sorted by length), for pruning the enumeration.
  BoxTree::Coordinates lo_, hi_;
  double gap_[3];
};

// Whether LatticeIndex would offer target (prepared basis) to mover: the pair-level form of the
// screen, for tests and the reference comparison.
bool LatticeScreenPasses(const Eigen::Matrix3d& mover, const Eigen::Matrix3d& target,
                         double length_tolerance, double angle_tolerance);

}  // namespace nucleate::match
