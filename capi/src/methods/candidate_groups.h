// Duplicate groups of the candidates of a Sample reply: the one place that fills the reply's
// groups, each candidate's group and representative flag, and the unique counts, for Sample and
// for MergeSamples alike (so a merged reply groups exactly as the whole request would).
#pragma once

#include <vector>

#include "core/match/tolerances.h"
#include "core/structure/crystal.h"
#include "nucleate/v1/sample.pb.h"

namespace nucleate::capi {

// `finished[k]` is the structure of candidate `candidate_of[k]` of `reply`, in ascending sample
// index; failed candidates are not among them and keep group -1. Replaces any groups in `reply`.
void GroupCandidates(const std::vector<structure::Crystal>& finished,
                     const std::vector<int>& candidate_of, const match::MatchTolerances& tolerances,
                     int threads, v1::SampleReply* reply);

}  // namespace nucleate::capi
