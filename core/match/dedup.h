// Grouping of equivalent structures (Deduplicate) and look-up of candidates among known
// structures (Novelty): each structure is prepared and fingerprinted once (fingerprint.h), and
// only pairs of one fingerprint key whose lattices admit a lattice mapping (the exact screen of
// candidate_index.h / lattice_index.h) are matched pairwise (structure_matcher.h), each structure
// against group representatives only. Each such pair first meets the anchor screen
// (anchor_screen.h) on a small record per structure, which settles most non-matching pairs
// without touching their sites. The cost is linear in the number of structures times the number
// of lattice-compatible representatives each has, and that number is set by the tolerances: at
// the defaults (length 0.2, angle 5 degrees, volumes rescaled) about 2 % of all pairs of distinct
// structures of one formula admit a lattice mapping, whether they come from a few structure types
// or from a thousand, so the pairs grow with the square of the distinct structures and the
// screen makes each cheap (under a microsecond), not fewer; at length 0.05, site 0.15 and angle 2
// degrees the cost is near-linear (tests/bench/bench_dedup measures both).
#pragma once

#include <cstdint>
#include <vector>

#include "core/match/candidate_index.h"
#include "core/match/tolerances.h"
#include "core/structure/crystal.h"

namespace nucleate::match {

struct DedupResult {
  // Groups in order of their representative; each lists input indices ascending, the first being
  // the representative.
  std::vector<std::vector<int>> groups;
  std::vector<int> group_of;      // per input structure: its group's position in `groups`
  // Pairwise matches run (cost measure, the same for any thread count). Includes the matches
  // of a chunk's unmatched members against each other that turn out not to be needed (see
  // Deduplicate), so it can exceed the count of the plain sequential rule by a little.
  std::int64_t pairs_matched = 0;
  // Of those, the pairs the anchor screen let through to the full site search: pairs whose
  // lattices and anchor sites agree within the tolerances (every pair of a query whose lattice
  // enumeration was refused). The same for any thread count.
  std::int64_t pairs_past_screens = 0;
};

// Greedy in input order: structure i joins the group of the lowest-index representative it
// matches (MatchPrepared(i, representative)); if none, it founds a new group. The result is that
// of this sequential rule for any thread count: work is done in chunks, each chunk first matched
// in parallel against the representatives of earlier chunks; then its unmatched members are
// matched in parallel against each other (each against the lower ones, up to the first match)
// and resolved in order. `threads` >= 1; 0 means std::thread::hardware_concurrency().
// Raises InvalidArgument("threads") for a negative count, LimitExceeded("threads") above
// kMaxThreads (core/common/thread_count.h), and any error of Prepare for
// structure k inside field "structures[k]" (the lowest such k).
DedupResult Deduplicate(const std::vector<structure::Crystal>& structures,
                        const MatchTolerances& tolerances, int threads,
                        DedupScreen screen = DedupScreen::kFingerprint);

struct NoveltyResult {
  std::vector<char> novel;        // per candidate: 1 when it matches no reference
  std::vector<int> reference;     // per candidate: lowest index of a matching reference, or -1
  std::int64_t pairs_matched = 0;
  std::int64_t pairs_past_screens = 0;  // as in DedupResult
};

// For each candidate, whether it matches any reference (MatchPrepared(candidate, reference)).
// Errors name "candidates[k]" or "references[k]".
NoveltyResult Novelty(const std::vector<structure::Crystal>& candidates,
                      const std::vector<structure::Crystal>& references,
                      const MatchTolerances& tolerances, int threads,
                      DedupScreen screen = DedupScreen::kFingerprint);

}  // namespace nucleate::match
