#include "methods/candidate_groups.h"

#include "core/match/dedup.h"

namespace nucleate::capi {

void GroupCandidates(const std::vector<structure::Crystal>& finished,
                     const std::vector<int>& candidate_of, const match::MatchTolerances& tolerances,
                     int threads, v1::SampleReply* reply) {
  reply->clear_groups();
  for (v1::Candidate& candidate : *reply->mutable_candidates()) {
    candidate.set_group(-1);
    candidate.set_representative(false);
  }
  v1::SampleSummary* summary = reply->mutable_summary();
  summary->set_valid_unique(0);
  // Greedy in index order (core/match/dedup.h): representatives are the lowest indices.
  const match::DedupResult groups = match::Deduplicate(finished, tolerances, threads);
  for (const std::vector<int>& members : groups.groups) {
    v1::CandidateGroup* group = reply->add_groups();
    for (int k : members) {
      v1::Candidate* candidate = reply->mutable_candidates(candidate_of[k]);
      candidate->set_group(reply->groups_size() - 1);
      candidate->set_representative(k == members.front());
      group->add_indices(candidate->index());
    }
    if (reply->candidates(candidate_of[members.front()]).report().valid()) {
      summary->set_valid_unique(summary->valid_unique() + 1);
    }
  }
  summary->set_unique(reply->groups_size());
}

}  // namespace nucleate::capi
