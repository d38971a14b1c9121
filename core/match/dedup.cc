#include "core/match/dedup.h"

#include <algorithm>
#include <cstddef>
#include <atomic>
#include <limits>
#include <string>

#include "core/common/error.h"
#include "core/common/parallel_for.h"
#include "core/common/thread_count.h"
#include "core/match/anchor_screen.h"
#include "core/match/candidate_index.h"
#include "core/match/fingerprint.h"
#include "core/match/prepared_crystal.h"
#include "core/match/structure_matcher.h"

namespace nucleate::match {
namespace {

// Structures per chunk: large enough to keep threads busy, small enough that the work inside a
// chunk (its unmatched members matched against each other, which grows with the square of the
// chunk) stays a small share of the work.
constexpr std::size_t kChunk = 512;

struct Prepared {
  std::vector<PreparedCrystal> crystals;
  std::vector<Fingerprint> fingerprints;
  std::vector<TargetShape> shapes;  // per structure as a target, for MatchesUnderBases
};

Prepared PrepareAll(const std::vector<structure::Crystal>& structures,
                    const MatchTolerances& tolerances, DedupScreen screen, int threads,
                    const char* field) {
  const bool values = CandidateIndex::UsesFingerprintValues(screen, tolerances);
  ValidateTolerances(tolerances);
  Prepared p;
  p.crystals.resize(structures.size());
  p.fingerprints.resize(structures.size());
  ParallelFor(structures.size(), threads, [&](std::size_t i) {
    try {
      p.crystals[i] = Prepare(structures[i], tolerances);
    } catch (const Error& e) {
      throw e.WithinField(std::string(field) + "[" + std::to_string(i) + "]");
    }
    if (values) {
      p.fingerprints[i] = ComputeFingerprint(p.crystals[i], tolerances);
    } else {
      p.fingerprints[i].key = FingerprintKey(p.crystals[i], tolerances);
    }
  });
  p.shapes.reserve(structures.size());
  for (const auto& c : p.crystals) p.shapes.push_back(ShapeOf(c, tolerances));
  return p;
}

// Buffers of a query and its pairwise matches, kept from query to query.
struct MatchScratch {
  LatticeHits hits;
  std::vector<const CandidateBasis*> bases;
  MatcherWorkspace matcher;
  // The anchor screen's mover side per basis of `hits` (anchor_screen.h), computed when a pair
  // first needs it: a basis reaches many targets.
  std::vector<AnchorMover> movers;
  std::vector<char> mover_ready;
  ScreenedBlocks screened;  // of the query structure
  std::int64_t past_screens = 0;  // pairs that went on to the site search (cost measure)
};

// index.Query into scratch->hits, forgetting the mover sides of the previous query's bases.
void RunQuery(const CandidateIndex& index, const Fingerprint& fingerprint,
              const PreparedCrystal& crystal, MatchScratch* scratch) {
  index.Query(fingerprint, crystal, &scratch->hits);
  scratch->screened = ScreenedBlocksOf(crystal);
  scratch->movers.resize(scratch->hits.bases.size());
  scratch->mover_ready.assign(scratch->hits.bases.size(), 0);
}

// Whether the anchor screen lets some basis of hits[first, last) (or its mirror image) through:
// if not, MatchesUnderBases would reject the pair in its first test under every mapping.
bool AnchorScreenPasses(const PreparedCrystal& mover, const TargetShape& target,
                        const MatchTolerances& tolerances, std::size_t first, std::size_t last,
                        MatchScratch* scratch) {
  for (std::size_t h = first; h < last; ++h) {
    const int b = scratch->hits.hits[h].second;
    if (!scratch->mover_ready[b]) {
      const LatticeMapping& mapping = scratch->hits.bases[b].mapping;
      SetAnchorMover(mover, scratch->screened, mapping.coefficients, mapping.basis,
                     &scratch->movers[b]);
      scratch->mover_ready[b] = 1;
    }
    const AnchorShifts shifts =
        AnchorShiftsThatMayPass(scratch->movers[b], target.anchor, tolerances.site_tolerance);
    if (shifts.plus != 0 || shifts.minus != 0) return true;
  }
  return false;
}

// Whether `mover` matches target j, where hits[first, last) are the query's entries for j:
// MatchPrepared(mover, target, tolerances, true).match in both branches (with the bases the
// lattice screen found, MatchesUnderBases skips the lattice search).
bool Matches(const PreparedCrystal& mover, const Prepared& targets, int j,
             const MatchTolerances& tolerances, std::size_t first, std::size_t last,
             MatchScratch* scratch) {
  if (!scratch->hits.bases_known) {
    ++scratch->past_screens;
    return MatchPrepared(mover, targets.crystals[j], tolerances, true).match;
  }
  if (!AnchorScreenPasses(mover, targets.shapes[j], tolerances, first, last, scratch)) {
    return false;
  }
  ++scratch->past_screens;
  scratch->bases.clear();
  for (std::size_t h = first; h < last; ++h) {
    scratch->bases.push_back(&scratch->hits.bases[scratch->hits.hits[h].second]);
  }
  return MatchesUnderBases(mover, targets.crystals[j], tolerances, targets.shapes[j],
                           scratch->bases, &scratch->matcher);
}

// The end of the run of entries for one id that starts at `first`.
std::size_t RunEnd(const std::vector<std::pair<int, int>>& hits, std::size_t first) {
  std::size_t last = first + 1;
  while (last < hits.size() && hits[last].first == hits[first].first) ++last;
  return last;
}

// Issues prefetches for the `bytes` bytes from `p`: targets lie wherever their structures were
// prepared, so each pair would otherwise start with a cache miss.
void Prefetch(const void* p, std::size_t bytes) {
  const char* c = static_cast<const char*>(p);
  for (std::size_t offset = 0; offset < bytes; offset += 64) __builtin_prefetch(c + offset);
  __builtin_prefetch(c + bytes - 1);
}

// What the anchor screen reads of a target first: its cell, site counts and leading offsets (the
// rest of the record, and the prepared crystal, only for the few pairs that pass).
void PrefetchScreenRecord(const Prepared& targets, int id) {
  Prefetch(&targets.shapes[id].anchor, offsetof(AnchorTarget, offset) + 4 * sizeof(double[3]));
}

// The lowest id in scratch->hits, from entry `from` on and below `below`, that `mover` matches
// and `eligible(id)` allows, or -1. *next receives the entry after the matching id's (or the end).
// Each target tried counts as one pair.
template <typename Eligible>
int FirstMatch(const PreparedCrystal& mover, const Prepared& targets,
               const MatchTolerances& tolerances, std::size_t from, int below,
               const Eligible& eligible, MatchScratch* scratch, std::int64_t* pairs,
               std::size_t* next = nullptr) {
  const auto& hits = scratch->hits.hits;
  // The start of the next run of entries, whose target is prefetched while this one is screened.
  std::size_t first = from;
  std::size_t ahead = first < hits.size() ? RunEnd(hits, first) : hits.size();
  if (first < hits.size()) PrefetchScreenRecord(targets, hits[first].first);
  while (first < hits.size() && hits[first].first < below) {
    const int id = hits[first].first;
    const std::size_t last = ahead;
    if (ahead < hits.size()) {
      PrefetchScreenRecord(targets, hits[ahead].first);
      ahead = RunEnd(hits, ahead);
    }
    if (eligible(id)) {
      ++*pairs;
      if (Matches(mover, targets, id, tolerances, first, last, scratch)) {
        if (next) *next = last;
        return id;
      }
    }
    first = last;
  }
  if (next) *next = hits.size();
  return -1;
}

}  // namespace

DedupResult Deduplicate(const std::vector<structure::Crystal>& structures,
                        const MatchTolerances& tolerances, int threads, DedupScreen screen) {
  const int workers = ResolveThreadCount(threads);
  const Prepared p = PrepareAll(structures, tolerances, screen, workers, "structures");
  const int n = static_cast<int>(structures.size());

  DedupResult result;
  result.group_of.assign(n, -1);
  CandidateIndex representatives(screen, tolerances);
  std::atomic<std::int64_t> pairs{0};
  const auto everyone = [](int) { return true; };
  const int no_limit = std::numeric_limits<int>::max();
  std::vector<int> found(kChunk);
  std::vector<std::size_t> first_open(kChunk);  // phase 2: the hit after m(i)'s
  std::vector<MatchScratch> scratch(workers);   // per worker, kept from chunk to chunk

  for (int start = 0; start < n; start += static_cast<int>(kChunk)) {
    const int end = std::min(n, start + static_cast<int>(kChunk));
    const std::size_t size = static_cast<std::size_t>(end - start);
    // Phase 1, parallel: the lowest-index earlier representative each member matches. The index
    // only holds representatives of earlier chunks here and is not modified meanwhile.
    ParallelFor(size, workers, [&](std::size_t k, int worker) {
      const int i = start + static_cast<int>(k);
      std::int64_t tried = 0;
      RunQuery(representatives, p.fingerprints[i], p.crystals[i], &scratch[worker]);
      found[k] = FirstMatch(p.crystals[i], p, tolerances, 0, no_limit, everyone,
                            &scratch[worker], &tried);
      pairs += tried;
    });
    // Phase 2: members without an earlier match ("open") may found a group, or join one founded
    // in this chunk: the lowest-index such representative they match, as the sequential rule
    // says. Which open members are representatives depends on that very resolution, so the
    // parallel part matches each open member i against every open member below it (a superset of
    // the representatives it could join) and keeps the lowest it matches, m(i). Resolving in
    // order then needs no more matching in the usual case: if m(i) is none, no representative
    // below i matches and i founds a group; if m(i) is a representative, every lower open member,
    // representative or not, failed to match, so m(i) is the lowest representative i matches.
    // Only when m(i) itself joined a group does i go on, past m(i), through representatives alone.
    // The extra pairs (open members that turn out not to be representatives) are the same for
    // any thread count. Open members are held in an index of their own, so these queries search
    // a few hundred structures, not all representatives.
    CandidateIndex open(screen, tolerances);
    std::vector<int> open_ids;
    for (int i = start; i < end; ++i) {
      if (found[i - start] >= 0) continue;
      open.Insert(i, &p.fingerprints[i], p.crystals[i]);
      open_ids.push_back(i);
    }
    open.Compact();
    ParallelFor(open_ids.size(), workers, [&](std::size_t q, int worker) {
      const int i = open_ids[q];
      const std::size_t k = static_cast<std::size_t>(i - start);
      std::int64_t tried = 0;
      RunQuery(open, p.fingerprints[i], p.crystals[i], &scratch[worker]);
      found[k] = FirstMatch(p.crystals[i], p, tolerances, 0, i, everyone, &scratch[worker],
                            &tried, &first_open[k]);
      pairs += tried;
    });
    std::int64_t tried = 0;
    const auto is_representative = [&](int j) { return result.groups[result.group_of[j]][0] == j; };
    for (int i = start; i < end; ++i) {
      const std::size_t k = static_cast<std::size_t>(i - start);
      int rep = found[k];
      if (rep >= 0 && rep >= start && !is_representative(rep)) {
        // m(i) joined a group: go on. The query is run again (rarely needed, so its hits were
        // not kept); on the unchanged index it gives the same hits, so first_open[k] holds.
        RunQuery(open, p.fingerprints[i], p.crystals[i], &scratch[0]);
        rep = FirstMatch(p.crystals[i], p, tolerances, first_open[k], i, is_representative,
                         &scratch[0], &tried);
      }
      if (rep < 0) {
        result.group_of[i] = static_cast<int>(result.groups.size());
        result.groups.push_back({i});
      } else {
        result.group_of[i] = result.group_of[rep];
        result.groups[result.group_of[rep]].push_back(i);
      }
    }
    pairs += tried;
    for (int i : open_ids) {
      if (is_representative(i)) representatives.Insert(i, &p.fingerprints[i], p.crystals[i]);
    }
    representatives.Compact();
  }
  result.pairs_matched = pairs.load();
  for (const MatchScratch& s : scratch) result.pairs_past_screens += s.past_screens;
  return result;
}

NoveltyResult Novelty(const std::vector<structure::Crystal>& candidates,
                      const std::vector<structure::Crystal>& references,
                      const MatchTolerances& tolerances, int threads, DedupScreen screen) {
  const int workers = ResolveThreadCount(threads);
  const Prepared c = PrepareAll(candidates, tolerances, screen, workers, "candidates");
  const Prepared r = PrepareAll(references, tolerances, screen, workers, "references");
  CandidateIndex index(screen, tolerances);
  for (std::size_t j = 0; j < references.size(); ++j) {
    index.Insert(static_cast<int>(j), &r.fingerprints[j], r.crystals[j]);
  }
  index.Compact();
  NoveltyResult result;
  result.novel.assign(candidates.size(), 1);
  result.reference.assign(candidates.size(), -1);
  std::atomic<std::int64_t> pairs{0};
  std::vector<MatchScratch> scratch(workers);
  ParallelFor(candidates.size(), workers, [&](std::size_t i, int worker) {
    std::int64_t tried = 0;
    RunQuery(index, c.fingerprints[i], c.crystals[i], &scratch[worker]);
    const int j = FirstMatch(c.crystals[i], r, tolerances, 0, std::numeric_limits<int>::max(),
                             [](int) { return true; }, &scratch[worker], &tried);
    if (j >= 0) {
      result.novel[i] = 0;
      result.reference[i] = j;
    }
    pairs += tried;
  });
  result.pairs_matched = pairs.load();
  for (const MatchScratch& s : scratch) result.pairs_past_screens += s.past_screens;
  return result;
}

}  // namespace nucleate::match
