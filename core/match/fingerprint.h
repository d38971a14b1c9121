// A cheap summary of a prepared crystal that does not depend on rotation, origin, atom order or
// cell choice, used to bucket structures before any pairwise matching (dedup.h). Dedup always
// uses the exact key; the continuous values only screen when supercells may match (elsewhere the
// exact lattice screen of lattice_index.h replaces them, see candidate_index.h).
//
// Two parts:
//  * key (exact): the reduced formula, plus the primitive site count unless supercells may
//    match. Structures with different keys never match.
//  * values (continuous), each with a width: structures within tolerance differ by at most about
//    one width in each value. Buckets are cells of side `width` on a grid; a structure is
//    compared with its own cell and the adjacent ones (bin edges), so a pair within one width
//    per value is never lost to a bin boundary.
//
// The values and why their widths suffice:
//  * log of the successive minima of the lattice (the shortest basis lengths) at equal volume per
//    atom. A match maps a basis of A within (1 + ltol) in length and angle_tol in angle onto B's
//    shortest basis; for reduced cells (|cos| <= 1/2, smallest eigenvalue of the normalised Gram
//    matrix >= 1/2) an angle change of angle_tol changes any lattice vector's length by at most a
//    factor (1 + 2 sin(angle_tol)), so each minimum moves by at most
//    log(1 + ltol) + log(1 + 2 sin(angle_tol)).  Omitted when supercells may match (the cells
//    then differ in size).
//  * log volume per atom, only without volume rescaling: the three lengths and angles bound it,
//    width 3 log(1 + ltol) + 3 angle_tol (radians; |d log sin| <= |cot 60 deg| per angle < 1).
//  * per element, the mean nearest-neighbour distance of its sites in units of (V/N)^(1/3).
//    Displacements under stol (after removing the mean shift) change any site's nearest-neighbour
//    distance by less than 2 stol, so the mean moves by less than 2 stol; strain within the
//    length tolerance adds about ltol / 2 of a typical (unit) distance. Width 2 stol + ltol / 2.
//    The strain part is an allowance, not a proof (a strongly sheared cell could exceed it), which
//    is why the default (no supercell) path no longer uses these values; DedupScreen::kFormulaOnly
//    skips them for an exhaustive comparison.
#pragma once

#include <string>
#include <vector>

#include "core/match/prepared_crystal.h"
#include "core/match/tolerances.h"

namespace nucleate::match {

struct Fingerprint {
  std::string key;
  std::vector<double> values;
  std::vector<double> widths;  // one per value, equal for all structures of one key
};

Fingerprint ComputeFingerprint(const PreparedCrystal& crystal, const MatchTolerances& tolerances);

// The key alone (Fingerprint::key), for screens that use no values: the values' nearest-neighbour
// search is most of a fingerprint's cost.
std::string FingerprintKey(const PreparedCrystal& crystal, const MatchTolerances& tolerances);

// Same key and every value within its width. A false here means the pair is not compared.
bool MayMatch(const Fingerprint& x, const Fingerprint& y);

// Grid cell of the first `dims` values (floor(value / width)).
std::vector<long> GridCell(const Fingerprint& f, std::size_t dims);

}  // namespace nucleate::match
