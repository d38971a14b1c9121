#include "methods/merge_samples_method.h"

#include <cstdint>
#include <map>
#include <string>
#include <utility>
#include <vector>

#include "core/common/error.h"
#include "core/common/thread_count.h"
#include "core/structure/validate.h"
#include "methods/candidate_groups.h"
#include "methods/match_methods.h"
#include "methods/sample_method.h"
#include "methods/structure_inputs.h"
#include "methods/within_field.h"
#include "nucleate/v1/sample.pb.h"

namespace nucleate::capi {
namespace {

std::string CandidateField(int part, int k) {
  return "parts[" + std::to_string(part) + "].candidates[" + std::to_string(k) + "]";
}

void HandleMergeSamples(const v1::MergeSamplesRequest& merge, v1::SampleReply* reply,
                        const CallContext&) {
  const v1::SampleRequest& request = merge.request();
  const match::MatchTolerances tolerances =
      WithinField("request", [&] { return TolerancesFromMessage(request.tolerances()); });
  const int threads =
      ResolveThreadCount(request.has_threads() ? request.threads() : 0, "request.threads");
  const std::uint64_t first = request.first_index();
  const std::uint64_t count = request.has_count() ? request.count() : 1;
  if (merge.parts_size() == 0) {
    throw InvalidArgument("parts", "required: at least one Sample reply");
  }

  // Every candidate by sample index, each inside the request's range and in one part only.
  std::map<std::uint32_t, std::pair<int, int>> where;  // index -> (part, position)
  v1::SampleSummary* summary = reply->mutable_summary();
  for (int p = 0; p < merge.parts_size(); ++p) {
    const v1::SampleReply& part = merge.parts(p);
    for (int k = 0; k < part.candidates_size(); ++k) {
      const std::uint32_t index = part.candidates(k).index();
      if (index < first || index >= first + count) {
        throw InvalidArgument(CandidateField(p, k) + ".index",
                              "sample index " + std::to_string(index) +
                                  " is outside the request's range [" + std::to_string(first) +
                                  ", " + std::to_string(first + count) + ")");
      }
      const auto [at, inserted] = where.emplace(index, std::make_pair(p, k));
      if (!inserted) {
        throw InvalidArgument(CandidateField(p, k) + ".index",
                              "sample index " + std::to_string(index) + " is also in " +
                                  CandidateField(at->second.first, at->second.second) +
                                  ": the parts must answer disjoint ranges of one request");
      }
    }
    const v1::SampleSummary& s = part.summary();
    summary->set_finished(summary->finished() + s.finished());
    summary->set_failed(summary->failed() + s.failed());
    summary->set_valid(summary->valid() + s.valid());
    summary->set_cancelled(summary->cancelled() || s.cancelled());
    summary->set_evaluations(summary->evaluations() + s.evaluations());
  }
  summary->set_requested(static_cast<int>(count));
  if (where.size() < count && !summary->cancelled()) {
    std::uint64_t missing = first;
    for (const auto& entry : where) {
      if (entry.first != missing) break;
      ++missing;
    }
    throw InvalidArgument("parts", std::to_string(count - where.size()) + " of " +
                                       std::to_string(count) +
                                       " sample indices are in no part (the first: " +
                                       std::to_string(missing) +
                                       ") and no part was cancelled: is a part missing?");
  }

  // Candidates in index order, each report numbered by its new position, as Sample numbers them.
  const structure::StructureLimits limits;
  std::vector<structure::Crystal> finished;
  std::vector<int> candidate_of;
  for (const auto& [index, origin] : where) {
    const v1::Candidate& from = merge.parts(origin.first).candidates(origin.second);
    v1::Candidate* candidate = reply->add_candidates();
    *candidate = from;
    candidate->mutable_report()->set_index(reply->candidates_size() - 1);
    if (from.report().has_error()) continue;
    try {
      finished.push_back(FromMessage(from.structure(), limits));
      structure::ValidateCrystal(finished.back(), limits);
    } catch (const Error& e) {
      throw e.WithinField(CandidateField(origin.first, origin.second) + ".structure");
    }
    candidate_of.push_back(reply->candidates_size() - 1);
  }
  GroupCandidates(finished, candidate_of, tolerances, threads, reply);
  reply->set_caution(CandidateCaution());
}

}  // namespace

MethodEntry MergeSamplesMethod() {
  return MakeMethod<v1::MergeSamplesRequest, v1::SampleReply, &HandleMergeSamples>("MergeSamples");
}

}  // namespace nucleate::capi
