// Runs a sampling job: every sample's chain from its start to a structure, on the caller's
// threads, with progress and cancellation. Checking, symmetrising and grouping the candidates is
// the caller's next step (the Sample method of the C ABI).
#pragma once

#include <cstdint>
#include <functional>
#include <optional>
#include <vector>

#include "core/common/error.h"
#include "core/model/bundle/model_bundle.h"
#include "core/sample/chain.h"
#include "core/sample/sample_job.h"
#include "core/structure/crystal.h"

namespace nucleate::sample {

struct SampleOutcome {
  std::uint32_t index = 0;                  // the absolute sample index
  std::optional<structure::Crystal> crystal;
  std::optional<Error> error;               // a sample whose chain failed (e.g. a cell blew up)
};

struct SampleRun {
  // Finished samples, ascending index. After a cancellation with several threads, the finished
  // ones need not be the lowest indices.
  std::vector<SampleOutcome> samples;
  bool cancelled = false;
  std::int64_t evaluations = 0;        // network calls (guided calls count twice)
};

// Called on the calling thread only, with the work done and the total counted in sample steps
// (one sample moved one level): after each step the calling thread runs itself, and while it
// waits for the other threads, whenever they have moved on (checked every 50 ms). Returning
// false cancels: every thread stops before its next step, finished samples are returned, the
// samples in progress are dropped.
using SampleObserver = std::function<bool(std::int64_t done, std::int64_t total)>;

// Bytes the job will need at most, estimated from its largest cell before anything is allocated.
std::int64_t EstimateSamplingBytes(const model::Architecture& architecture, int max_atoms,
                                   int threads, std::uint32_t count);

// The network as denoiser. Errors: those of SampleSetup, ValidateSamplerSettings, and
// LimitExceeded naming "limits.max_count", "limits.max_evaluations" or "limits.max_memory_bytes".
SampleRun RunSampling(const model::ModelBundle& bundle, const SampleJob& job,
                      const SampleObserver& observer = {});

// Any denoiser (analytic ones in tests): the same chains, the same streams.
SampleRun RunSamplingWith(const model::ModelBundle& bundle, const DenoisingFunction& denoiser,
                          const SampleJob& job, const SampleObserver& observer = {});

}  // namespace nucleate::sample
