#include "core/match/dedup.h"

#include <algorithm>
#include <atomic>
#include <string>
#include <thread>

#include "core/common/error.h"
#include "core/match/candidate_index.h"
#include "core/match/fingerprint.h"
#include "core/match/parallel_for.h"
#include "core/match/prepared_crystal.h"
#include "core/match/structure_matcher.h"

namespace nucleate::match {
namespace {

// Structures per chunk: large enough to keep threads busy, small enough that the sequential
// resolution inside a chunk (matching against representatives founded in the same chunk) stays a
// small share of the work.
constexpr std::size_t kChunk = 512;

int ThreadCount(int threads) {
  if (threads < 0) throw InvalidArgument("threads", "must be >= 0 (0: all hardware threads)");
  if (threads == 0) return static_cast<int>(std::max(1u, std::thread::hardware_concurrency()));
  return threads;
}

struct Prepared {
  std::vector<PreparedCrystal> crystals;
  std::vector<Fingerprint> fingerprints;
};

Prepared PrepareAll(const std::vector<structure::Crystal>& structures,
                    const MatchTolerances& tolerances, int threads, const char* field) {
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
    p.fingerprints[i] = ComputeFingerprint(p.crystals[i], tolerances);
  });
  return p;
}

}  // namespace

DedupResult Deduplicate(const std::vector<structure::Crystal>& structures,
                        const MatchTolerances& tolerances, int threads, DedupScreen screen) {
  const int workers = ThreadCount(threads);
  const Prepared p = PrepareAll(structures, tolerances, workers, "structures");
  const int n = static_cast<int>(structures.size());

  DedupResult result;
  result.group_of.assign(n, -1);
  CandidateIndex representatives(screen, tolerances);
  std::atomic<std::int64_t> pairs{0};
  std::vector<int> found(kChunk);

  for (int start = 0; start < n; start += static_cast<int>(kChunk)) {
    const int end = std::min(n, start + static_cast<int>(kChunk));
    // Phase 1, parallel: the lowest-index earlier representative each member matches. The index
    // only holds representatives of earlier chunks here and is not modified meanwhile.
    ParallelFor(static_cast<std::size_t>(end - start), workers, [&](std::size_t k) {
      const int i = start + static_cast<int>(k);
      found[k] = -1;
      std::vector<int> candidates;
      representatives.Query(p.fingerprints[i], p.crystals[i], &candidates);
      for (int j : candidates) {
        ++pairs;
        if (MatchPrepared(p.crystals[i], p.crystals[j], tolerances, true).match) {
          found[k] = j;
          break;
        }
      }
    });
    // Phase 2, in order: members without an earlier match try this chunk's new representatives
    // (all of higher index than any earlier one, so the lowest-index rule still holds). They are
    // held in an index of their own until the chunk ends, so these sequential queries search a
    // few hundred representatives, not all of them.
    CandidateIndex fresh(screen, tolerances);
    std::vector<int> founded;
    std::vector<int> candidates;
    for (int i = start; i < end; ++i) {
      int rep = found[i - start];
      if (rep < 0) {
        fresh.Query(p.fingerprints[i], p.crystals[i], &candidates);
        for (int j : candidates) {
          ++pairs;
          if (MatchPrepared(p.crystals[i], p.crystals[j], tolerances, true).match) {
            rep = j;
            break;
          }
        }
      }
      if (rep < 0) {
        result.group_of[i] = static_cast<int>(result.groups.size());
        result.groups.push_back({i});
        fresh.Insert(i, &p.fingerprints[i], p.crystals[i]);
        founded.push_back(i);
      } else {
        result.group_of[i] = result.group_of[rep];
        result.groups[result.group_of[rep]].push_back(i);
      }
    }
    for (int i : founded) representatives.Insert(i, &p.fingerprints[i], p.crystals[i]);
  }
  result.pairs_matched = pairs.load();
  return result;
}

NoveltyResult Novelty(const std::vector<structure::Crystal>& candidates,
                      const std::vector<structure::Crystal>& references,
                      const MatchTolerances& tolerances, int threads, DedupScreen screen) {
  const int workers = ThreadCount(threads);
  const Prepared c = PrepareAll(candidates, tolerances, workers, "candidates");
  const Prepared r = PrepareAll(references, tolerances, workers, "references");
  CandidateIndex index(screen, tolerances);
  for (std::size_t j = 0; j < references.size(); ++j) {
    index.Insert(static_cast<int>(j), &r.fingerprints[j], r.crystals[j]);
  }
  NoveltyResult result;
  result.novel.assign(candidates.size(), 1);
  result.reference.assign(candidates.size(), -1);
  std::atomic<std::int64_t> pairs{0};
  ParallelFor(candidates.size(), workers, [&](std::size_t i) {
    std::vector<int> found;
    index.Query(c.fingerprints[i], c.crystals[i], &found);
    for (int j : found) {
      ++pairs;
      if (MatchPrepared(c.crystals[i], r.crystals[j], tolerances, true).match) {
        result.novel[i] = 0;
        result.reference[i] = j;
        break;
      }
    }
  });
  result.pairs_matched = pairs.load();
  return result;
}

}  // namespace nucleate::match
