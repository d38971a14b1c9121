// Are two crystals the same structure, up to the choice of cell, origin, atom order, rotation
// (and reflection), and a distortion within tolerance?
//
// The method (lattice-mapping enumeration, then site assignment): both crystals are prepared
// (prepared_crystal.h: primitive cell, shortest basis, equal volume per atom). Every basis of A's
// lattice that resembles B's shortest basis within the length and angle tolerances is a candidate
// cell (lattice_mapping.h). For each, A's sites are re-expressed in that basis; distances are
// measured in the cell whose parameters are the average of the two cells' parameters, in units of
// (V/N)^(1/3) of that average cell. Trial origins align one site of B's least frequent element onto
// each site of that element in A; under each, every element's sites are paired by an exact
// assignment and the mean displacement is removed (site_assignment.h). A and B match when some
// candidate and origin leave every site within the site tolerance. Most origins fail a quick test
// before any assignment (a site without a partner nearby); a cheaper screen of that test
// (anchor_screen.h) rules most of them out first, without changing any result.
#pragma once

#include <string>
#include <vector>

#include "core/match/anchor_screen.h"
#include "core/match/lattice_mapping.h"
#include "core/match/prepared_crystal.h"
#include "core/match/site_assignment.h"
#include "core/match/tolerances.h"
#include "core/structure/crystal.h"
#include "core/structure/lattice.h"

namespace nucleate::match {

struct MatchResult {
  bool match = false;
  // Of the best candidate: among matching ones the lowest rms; without a match, the one with the
  // smallest largest displacement. In units of (V/N)^(1/3); NaN when no site assignment was
  // reached (composition, site count or lattice differ).
  double rms = 0;
  double max_displacement = 0;
  // Empty on a match; otherwise "composition differs", "site counts differ: 2 vs 3",
  // "no lattice mapping within tolerance" or "sites too far: max 0.41 > 0.3".
  std::string reason;
};

// Raises InvalidArgument for bad tolerances, and what ValidateCrystal raises (naming the field)
// for a malformed crystal.
MatchResult MatchStructures(const structure::Crystal& a, const structure::Crystal& b,
                            const MatchTolerances& tolerances);

// The same on prepared crystals (both prepared with `tolerances`). With stop_at_first_match the
// search ends at the first matching candidate, whose rms need not be the lowest: dedup only needs
// the verdict.
MatchResult MatchPrepared(const PreparedCrystal& a, const PreparedCrystal& b,
                          const MatchTolerances& tolerances, bool stop_at_first_match = false);

// Buffers the matcher reuses from pair to pair, so matching a pair does not allocate.
struct MatcherWorkspace {
  std::vector<LatticeMapping> mappings;
  std::vector<Eigen::Vector3d> cosets, mapped;  // the mover's sites in a mapped basis
  std::vector<char> block_mapped;               // per block: whether `mapped` holds it yet
  std::vector<std::pair<int, int>> check_order;
  SiteWorkspace sites;
  AnchorMover anchor;  // the anchor screen's mover side for the current mapping
};

// The cell in which the matcher measures displacements: its lengths and angles are the means of
// those of x (a mapped basis of the mover) and q (the target's ParametersFromMatrix, computed once
// per pair rather than per mapping), so neither structure is privileged and a uniform strain
// splits evenly between them.
Eigen::Matrix3d AverageLattice(const Eigen::Matrix3d& x, const structure::LatticeParameters& q);

// What MatchesUnderBases needs of a target beyond its prepared form: computed once per
// structure rather than once per pair.
struct TargetShape {
  MappingTest test;                       // MappingTest(b.lattice, ltol, angle_tol)
  structure::LatticeParameters parameters;  // ParametersFromMatrix(b.lattice)
  AnchorTarget anchor;                      // AnchorTargetOf(b), for the anchor screen
};
TargetShape ShapeOf(const PreparedCrystal& b, const MatchTolerances& tolerances);

// MatchPrepared(a, b, tolerances, true).match when a's lattice has already been searched, as
// dedup's lattice screen does (LatticeIndex): `bases` must hold, up to sign, every basis that
// FindLatticeMappings(a.lattice, b.lattice, ..., 1) returns, each with det +-1 and its lengths and
// angles as LatticePointsWithin and AngleDegrees compute them; extra bases are filtered out by
// MappingTest. `shape` must be ShapeOf(b, tolerances). Skips the lattice-point enumeration and
// mapping search of each pair.
bool MatchesUnderBases(const PreparedCrystal& a, const PreparedCrystal& b,
                       const MatchTolerances& tolerances, const TargetShape& shape,
                       const std::vector<const CandidateBasis*>& bases,
                       MatcherWorkspace* workspace);

}  // namespace nucleate::match
