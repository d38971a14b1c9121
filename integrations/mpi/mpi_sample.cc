#include "mpi_sample.h"

#include <cstdint>
#include <string>
#include <vector>

#include "abi_client.h"
#include "interruptible_call.h"
#include "rank_messages.h"

namespace nucleate::mpi {
namespace {

// The request for indices [first, first + count): the same settings with first_index and count
// replaced, planned by the same code as the whole request.
cli::SamplePlan SlicePlan(const cli::SampleSettings& settings, std::uint64_t first,
                          std::uint64_t count) {
  cli::SampleSettings slice = settings;
  slice.values["first_index"] = {std::to_string(first), "the MPI slice of this rank"};
  slice.values["count"] = {std::to_string(count), "the MPI slice of this rank"};
  return cli::PlanSample(slice);
}

// What a rank sends to rank 0: its part's reply JSON, or the refusal that stopped it.
struct RankOutcome {
  int status = 0;  // NUCLEATE_OK, or the refusal's status
  std::string text;
  bool cancelled = false;
};

std::string RunRank(const cli::SampleSettings& settings, const cli::SamplePlan& plan, int rank,
                    int ranks, std::ostream* log, RankOutcome* outcome) {
  const std::uint64_t first = plan.first_index, count = plan.count;
  const std::uint64_t begin = first + count * rank / ranks;
  const std::uint64_t end = first + count * (rank + 1) / ranks;
  if (end == begin) return R"({"summary":{}})";  // more ranks than samples: an empty part
  const cli::SamplePlan slice = SlicePlan(settings, begin, end - begin);
  return cli::CallWithProgress("Sample", slice.request_json, log, &outcome->cancelled,
                               /*quiet=*/rank != 0);
}

}  // namespace

cli::SampleCaller DistributedSampleCaller(MPI_Comm communicator) {
  int rank = 0, ranks = 1;
  MPI_Comm_rank(communicator, &rank);
  MPI_Comm_size(communicator, &ranks);
  cli::SampleCaller caller;
  caller.writes_outputs = rank == 0;
  caller.call = [communicator, rank, ranks](const cli::SampleSettings& settings,
                                            const cli::SamplePlan& plan, std::ostream* log,
                                            bool* cancelled) -> std::string {
    RankOutcome outcome;
    try {
      outcome.text = RunRank(settings, plan, rank, ranks, log, &outcome);
    } catch (const cli::CallFailed& failure) {
      outcome.status = failure.status();
      outcome.text = failure.what();
    }
    // Everyone reports to rank 0, whatever happened, so no rank waits for a failed one.
    const std::vector<std::string> texts = GatherStrings(outcome.text, communicator);
    const std::vector<int> statuses = GatherInts(outcome.status, communicator);
    const std::vector<int> cancels = GatherInts(outcome.cancelled ? 1 : 0, communicator);
    if (rank != 0) return "";
    for (int r = 0; r < ranks; ++r) {
      if (statuses[r] != 0) {
        throw cli::CallFailed(statuses[r], texts[r] + " (on MPI rank " + std::to_string(r) +
                                               " of " + std::to_string(ranks) + ")");
      }
      if (cancels[r] != 0) *cancelled = true;
    }
    std::string merge = "{\"request\":" + plan.request_json + ",\"parts\":[";
    for (int r = 0; r < ranks; ++r) merge += (r > 0 ? "," : "") + texts[r];
    merge += "]}";
    return cli::CallJson("MergeSamples", merge);
  };
  return caller;
}

}  // namespace nucleate::mpi
