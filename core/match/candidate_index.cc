#include "core/match/candidate_index.h"

#include <algorithm>

namespace nucleate::match {

void CandidateIndex::Insert(int id, const Fingerprint* f) {
  buckets_[f->key][GridCell(*f, grid_dims_)].push_back({id, f});
}

void CandidateIndex::Query(const Fingerprint& f, std::vector<int>* out, int min_id) const {
  out->clear();
  const auto by_key = buckets_.find(f.key);
  if (by_key == buckets_.end()) return;
  const std::vector<long> centre = GridCell(f, grid_dims_);
  const std::size_t dims = centre.size();
  // Visit the 3^dims cells around the centre: a value within one width of ours lies in our cell
  // or a neighbour, wherever the bin edges fall.
  std::vector<long> cell(centre);
  std::vector<int> offset(dims, -1);
  while (true) {
    for (std::size_t k = 0; k < dims; ++k) cell[k] = centre[k] + offset[k];
    const auto bucket = by_key->second.find(cell);
    if (bucket != by_key->second.end()) {
      for (const Entry& e : bucket->second) {
        if (e.id < min_id) continue;
        if (grid_dims_ == 0 || MayMatch(f, *e.fingerprint)) out->push_back(e.id);
      }
    }
    std::size_t k = 0;
    while (k < dims && offset[k] == 1) offset[k++] = -1;
    if (k == dims) break;
    ++offset[k];
  }
  std::sort(out->begin(), out->end());
}

}  // namespace nucleate::match
