// Which stored structures a structure must be matched against: structures are filed by the exact
// fingerprint key (reduced formula and site count, fingerprint.h), and within a key by the
// screen the caller chose (DedupScreen in dedup.h):
//  * kFingerprint without supercell matching: the exact lattice screen (lattice_index.h), which
//    only drops pairs whose lattices admit no mapping, i.e. pairs the matcher rejects anyway;
//  * kFingerprint with supercell matching (cells of different size may match, so the lattice
//    screen does not apply): the fingerprint grid, the same or adjacent cells of the leading
//    fingerprint values and every value within its width;
//  * kFormulaOnly: every stored structure of the key (exhaustive).
#pragma once

#include <map>
#include <memory>
#include <string>
#include <vector>

#include "core/match/fingerprint.h"
#include "core/match/lattice_index.h"
#include "core/match/prepared_crystal.h"
#include "core/match/tolerances.h"

namespace nucleate::match {

enum class DedupScreen {
  kFingerprint,  // key + lattice screen (or fingerprint grid with supercells): the default
  kFormulaOnly,  // only the exact key (reduced formula, site count): every pair of one formula is
                 // matched; quadratic, the exhaustive comparison the screen is checked against
};

class CandidateIndex {
 public:
  CandidateIndex(DedupScreen screen, const MatchTolerances& tolerances);

  // Whether this screen reads Fingerprint::values (only the fingerprint grid does); if not, a
  // fingerprint holding only the key (FingerprintKey) serves.
  static bool UsesFingerprintValues(DedupScreen screen, const MatchTolerances& tolerances);

  // Not thread-safe against concurrent queries; ids must be inserted in increasing order. The
  // pointed-to fingerprint must outlive the index.
  void Insert(int id, const Fingerprint* fingerprint, const PreparedCrystal& crystal);

  // After a batch of inserts, before many queries: the same results, found faster
  // (BoxTree::Compact). Not thread-safe against concurrent queries.
  void Compact();

  // Ids that may match (f, crystal), ascending, optionally only those >= min_id, in *out (cleared
  // first). With the lattice screen each id comes with the bases of crystal's lattice that reach
  // it (LatticeHits, for MatchesUnderBases); otherwise each id is listed once with basis -1 and
  // bases_known is false. Read-only: safe from many threads while no Insert runs.
  void Query(const Fingerprint& f, const PreparedCrystal& crystal, LatticeHits* out,
             int min_id = 0) const;

  // The same, ids only.
  void Query(const Fingerprint& f, const PreparedCrystal& crystal, std::vector<int>* out,
             int min_id = 0) const;

 private:
  enum class Mode { kKeyOnly, kLattice, kFingerprintGrid };
  struct Entry {
    int id;
    const Fingerprint* fingerprint;
  };
  struct Bucket {
    std::vector<Entry> all;                                    // kKeyOnly
    std::unique_ptr<LatticeIndex> lattice;                     // kLattice
    std::map<std::vector<long>, std::vector<Entry>> grid;      // kFingerprintGrid
  };
  void QueryGrid(const Fingerprint& f, const Bucket& bucket, std::vector<int>* out,
                 int min_id) const;

  Mode mode_;
  MatchTolerances tolerances_;
  std::map<std::string, Bucket> buckets_;
};

}  // namespace nucleate::match
