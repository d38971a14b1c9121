// Fingerprint buckets: structures filed by exact key and grid cell, queried for everything that
// may match a fingerprint (same key, same or adjacent cell, values within widths).
#pragma once

#include <map>
#include <string>
#include <vector>

#include "core/match/fingerprint.h"

namespace nucleate::match {

class CandidateIndex {
 public:
  // grid_dims: how many leading fingerprint values form the grid (0: one bucket per key, and the
  // values are not screened either, for an exhaustive comparison).
  explicit CandidateIndex(std::size_t grid_dims) : grid_dims_(grid_dims) {}

  // Not thread-safe against concurrent queries; ids must be inserted in increasing order.
  void Insert(int id, const Fingerprint* fingerprint);

  // Ids that may match `f`, ascending, optionally only those >= min_id. Read-only: safe from many
  // threads while no Insert runs.
  void Query(const Fingerprint& f, std::vector<int>* out, int min_id = 0) const;

 private:
  struct Entry {
    int id;
    const Fingerprint* fingerprint;
  };
  std::size_t grid_dims_;
  std::map<std::string, std::map<std::vector<long>, std::vector<Entry>>> buckets_;
};

}  // namespace nucleate::match
