#include "core/match/candidate_index.h"

#include <algorithm>

namespace nucleate::match {
namespace {

// Leading fingerprint values used as grid dimensions: 3^4 = 81 neighbour cells per query.
constexpr std::size_t kGridDims = 4;

}  // namespace

bool CandidateIndex::UsesFingerprintValues(DedupScreen screen, const MatchTolerances& tolerances) {
  return CandidateIndex(screen, tolerances).mode_ == Mode::kFingerprintGrid;
}

CandidateIndex::CandidateIndex(DedupScreen screen, const MatchTolerances& tolerances)
    : tolerances_(tolerances) {
  if (screen == DedupScreen::kFormulaOnly) {
    mode_ = Mode::kKeyOnly;
  } else if (tolerances.allow_supercell) {
    // A supercell mapping searches superlattices of the smaller cell, not bases: the lattice
    // screen's premise (one basis of the mover like the target's) does not hold.
    mode_ = Mode::kFingerprintGrid;
  } else {
    mode_ = Mode::kLattice;
  }
}

void CandidateIndex::Insert(int id, const Fingerprint* f, const PreparedCrystal& crystal) {
  Bucket& bucket = buckets_[f->key];
  switch (mode_) {
    case Mode::kKeyOnly:
      bucket.all.push_back({id, f});
      break;
    case Mode::kLattice:
      if (!bucket.lattice) {
        bucket.lattice = std::make_unique<LatticeIndex>(tolerances_.length_tolerance,
                                                        tolerances_.angle_tolerance);
      }
      bucket.lattice->Insert(id, crystal.lattice);
      break;
    case Mode::kFingerprintGrid:
      bucket.grid[GridCell(*f, kGridDims)].push_back({id, f});
      break;
  }
}

void CandidateIndex::Compact() {
  for (auto& [key, bucket] : buckets_) {
    if (bucket.lattice) bucket.lattice->Compact();
  }
}

void CandidateIndex::Query(const Fingerprint& f, const PreparedCrystal& crystal,
                           std::vector<int>* out, int min_id) const {
  out->clear();
  const auto found = buckets_.find(f.key);
  if (found == buckets_.end()) return;
  const Bucket& bucket = found->second;
  switch (mode_) {
    case Mode::kKeyOnly:
      for (const Entry& e : bucket.all) {
        if (e.id >= min_id) out->push_back(e.id);
      }
      break;
    case Mode::kLattice:
      bucket.lattice->Query(crystal.lattice, out, min_id);
      break;
    case Mode::kFingerprintGrid:
      QueryGrid(f, bucket, out, min_id);
      break;
  }
}

void CandidateIndex::Query(const Fingerprint& f, const PreparedCrystal& crystal, LatticeHits* out,
                           int min_id) const {
  if (mode_ == Mode::kLattice) {
    out->bases.clear();
    out->hits.clear();
    out->bases_known = true;
    const auto found = buckets_.find(f.key);
    if (found != buckets_.end()) found->second.lattice->Query(crystal.lattice, out, min_id);
    return;
  }
  std::vector<int> ids;
  Query(f, crystal, &ids, min_id);
  out->bases.clear();
  out->hits.clear();
  out->bases_known = false;
  for (int id : ids) out->hits.emplace_back(id, -1);
}

void CandidateIndex::QueryGrid(const Fingerprint& f, const Bucket& bucket, std::vector<int>* out,
                               int min_id) const {
  const std::vector<long> centre = GridCell(f, kGridDims);
  const std::size_t dims = centre.size();
  // Visit the 3^dims cells around the centre: a value within one width of ours lies in our cell
  // or a neighbour, wherever the bin edges fall.
  std::vector<long> cell(centre);
  std::vector<int> offset(dims, -1);
  while (true) {
    for (std::size_t k = 0; k < dims; ++k) cell[k] = centre[k] + offset[k];
    const auto entries = bucket.grid.find(cell);
    if (entries != bucket.grid.end()) {
      for (const Entry& e : entries->second) {
        if (e.id >= min_id && MayMatch(f, *e.fingerprint)) out->push_back(e.id);
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
