#include "core/sample/sampler.h"

#include <algorithm>
#include <atomic>
#include <chrono>
#include <condition_variable>
#include <exception>
#include <mutex>
#include <cmath>
#include <string>
#include <thread>

#include "core/common/thread_count.h"
#include "core/model/diffusion.h"
#include "core/sample/network_denoiser.h"
#include "core/sample/reverse_levels.h"
#include "core/sample/reverse_step.h"
#include "core/sample/sample_setup.h"

namespace nucleate::sample {
namespace {


// Network calls per sample: one per level, one more per corrector step or Heun correction, twice
// that when guidance needs both the conditional and the unconditional prediction.
std::int64_t EvaluationsPerSample(const SampleJob& job, std::size_t levels) {
  const auto l = static_cast<std::int64_t>(levels);
  std::int64_t calls = l;
  if (job.sampler.kind == SamplerKind::kPredictorCorrector) calls += (l - 1) * job.sampler.corrector_steps;
  if (job.sampler.kind == SamplerKind::kProbabilityFlow) calls += l - 1;
  const double g = job.conditions.guidance;
  return g != 0.0 && g != 1.0 ? 2 * calls : calls;
}

structure::Crystal Finish(const model::ModelBundle& bundle, const SampleSetup& setup,
                          const SampleStart& start, std::uint32_t index) {
  const ChainState& state = start.state;
  const model::Architecture& a = bundle.architecture;
  structure::Crystal c;
  const int n = static_cast<int>(state.frac.size());
  c.lattice = start.keep_lattice
                  ? start.lattice
                  : model::FeaturesToLattice(setup.statistics().Unstandardise(state.lattice), n);
  for (int token : state.tokens) {
    if (token < 0 || token >= a.mask_token()) throw Internal("a species is still masked at the end");
    c.numbers.push_back(a.elements[token]);
  }
  c.frac = state.frac;
  c.label = "sample-" + std::to_string(index);
  return c;
}

}  // namespace

std::int64_t EstimateSamplingBytes(const model::Architecture& a, int max_atoms, int threads,
                                   std::uint32_t count) {
  const double n = max_atoms;
  // Edges of the largest cell: all ordered pairs below the cutoff size; above it, the neighbours
  // within the cutoff at the cell's mean density (4/3 pi r^3 per atom, r in units of
  // (V/N)^(1/3)) with a margin of 2 for uneven cells.
  const double edges = max_atoms < a.cutoff_from_atoms
                           ? n * (n - 1)
                           : n * 2 * (4.0 / 3.0) * M_PI * std::pow(a.cutoff, 3);
  const double h = a.hidden;
  // Per worker, float32: the network's stored activations (3 edge matrices per layer) and
  // scratch (about 6 more), the edge geometry, and the atom-level matrices.
  const double per_worker =
      4.0 * (edges * h * (3.0 * a.layers + 6) + edges * a.edge_features() +
             n * h * (6.0 * a.layers + 16) + n * (a.species_tokens() + 8));
  // Results: each candidate's lattice, coordinates and species, with bookkeeping.
  const double results = static_cast<double>(count) * (256.0 + 64.0 * n);
  return static_cast<std::int64_t>(per_worker * std::max(threads, 1) + results);
}

namespace {

// The chains for one job on a process the caller already built (the network denoiser holds a
// reference to the same one, so its lazily computed score scales are computed once).
SampleRun RunSamplingOn(const model::ModelBundle& bundle, const model::DiffusionProcess& process,
                        const DenoisingFunction& denoiser, const SampleJob& job,
                        const SampleObserver& observer) {
  const int threads = ResolveThreadCount(job.threads);
  if (job.count < 1) throw InvalidArgument("count", "must be >= 1");
  if (static_cast<std::int64_t>(job.count) > job.limits.max_count) {
    throw LimitExceeded("limits.max_count", std::to_string(job.count) +
                                                " samples asked; the limit per call is " +
                                                std::to_string(job.limits.max_count));
  }
  if (static_cast<std::uint64_t>(job.first_index) + job.count - 1 > 0xffffffffull) {
    throw InvalidArgument("first_index", "first_index + count - 1 must stay below 2^32");
  }
  ValidateSamplerSettings(job.sampler, process.steps());
  const std::vector<ReverseLevel> levels = BuildReverseLevels(process, job.sampler.steps);
  const SampleSetup setup(bundle, levels, job);
  // Where the chains start (a variation starts below the top level; the same for every sample).
  const std::size_t first = setup.Start(job.first_index).first_level;
  const std::int64_t evaluations = EvaluationsPerSample(job, levels.size() - first);
  if (evaluations > job.limits.max_evaluations) {
    throw LimitExceeded("limits.max_evaluations",
                        "each sample needs " + std::to_string(evaluations) +
                            " network evaluations; the limit is " +
                            std::to_string(job.limits.max_evaluations));
  }
  const std::int64_t bytes = EstimateSamplingBytes(bundle.architecture, setup.max_atoms(), threads, job.count);
  if (bytes > job.limits.max_memory_bytes) {
    throw LimitExceeded("limits.max_memory_bytes",
                        "the job needs about " + std::to_string(bytes) + " bytes (" +
                            std::to_string(bytes >> 20) + " MiB); the limit is " +
                            std::to_string(job.limits.max_memory_bytes) + " bytes");
  }

  // Each worker runs whole chains, one sample at a time, taking the next index as it finishes;
  // worker 0 is the calling thread, which also reports progress, so the observer is only ever
  // called there. Samples never depend on each other, so the order in which workers take them
  // changes nothing in the results.
  const std::int64_t steps = static_cast<std::int64_t>(levels.size() - first);
  const std::int64_t total = static_cast<std::int64_t>(job.count) * steps;
  std::vector<SampleOutcome> outcomes(job.count);
  std::vector<char> finished(job.count, 0);
  std::atomic<std::uint32_t> next{0};
  std::atomic<std::int64_t> done{0};
  std::atomic<bool> stop{false};
  const int workers = static_cast<int>(std::min<std::uint32_t>(static_cast<std::uint32_t>(threads), job.count));
  std::atomic<int> running{workers};
  std::mutex mutex;
  std::condition_variable changed;
  std::exception_ptr failure;  // an error that is not a sample's own (e.g. out of memory)

  // Only the calling thread reports; each count once, and the last one (all done) always, even
  // when other workers finished the last steps after the calling thread ran out of samples.
  std::int64_t last_reported = -1;
  const auto report = [&] {
    const std::int64_t now = done.load();
    if (now == last_reported) return;
    last_reported = now;
    if (observer && !stop && !observer(now, total)) stop = true;
  };
  const auto work = [&](int worker) {
    Prediction scratch;
    try {
      for (std::uint32_t j = next++; j < job.count && !stop; j = next++) {
        SampleOutcome& outcome = outcomes[j];
        outcome.index = job.first_index + j;
        SampleStart start;
        try {
          start = setup.Start(outcome.index);
        } catch (const Error& e) {
          outcome.error = e.WithinField("samples[" + std::to_string(outcome.index) + "]");
        }
        bool ran = true;
        for (std::size_t k = first; k < levels.size(); ++k) {
          if (stop) {
            ran = false;
            break;
          }
          if (!outcome.error) {
            try {
              ReverseStep(denoiser, job.sampler, levels, k, start.constraints,
                          {job.seed, outcome.index}, worker, &scratch, &start.state);
            } catch (const Error& e) {
              outcome.error = e.WithinField("samples[" + std::to_string(outcome.index) + "]");
            }
          }
          if (k + 1 == levels.size() && !outcome.error) {
            try {
              outcome.crystal = Finish(bundle, setup, start, outcome.index);
            } catch (const Error& e) {
              outcome.error = e.WithinField("samples[" + std::to_string(outcome.index) + "]");
            }
          }
          if (k + 1 == levels.size()) finished[j] = 1;  // before the report of its last step
          ++done;
          if (worker == 0) {
            report();
          } else {
            changed.notify_one();
          }
        }
        if (!ran) break;
      }
    } catch (...) {
      std::lock_guard<std::mutex> lock(mutex);
      if (!failure) failure = std::current_exception();
      stop = true;
    }
    --running;
    changed.notify_one();
  };

  std::vector<std::thread> pool;
  for (int w = 1; w < workers; ++w) pool.emplace_back(work, w);
  work(0);
  // The calling thread has no sample left: it reports while the others finish theirs.
  {
    std::unique_lock<std::mutex> lock(mutex);
    while (running.load() > 0) {
      changed.wait_for(lock, std::chrono::milliseconds(50));
      lock.unlock();
      report();
      lock.lock();
    }
  }
  for (std::thread& t : pool) t.join();
  report();
  if (failure) std::rethrow_exception(failure);

  SampleRun run;
  run.cancelled = stop && !failure;
  for (std::uint32_t j = 0; j < job.count; ++j) {
    if (!finished[j]) continue;
    run.samples.push_back(std::move(outcomes[j]));
    run.evaluations += evaluations;
  }
  if (run.samples.size() == job.count) run.cancelled = false;
  return run;
}

}  // namespace

SampleRun RunSamplingWith(const model::ModelBundle& bundle, const DenoisingFunction& denoiser,
                          const SampleJob& job, const SampleObserver& observer) {
  const model::DiffusionProcess process(bundle.schedules, bundle.architecture);
  return RunSamplingOn(bundle, process, denoiser, job, observer);
}

SampleRun RunSampling(const model::ModelBundle& bundle, const SampleJob& job,
                      const SampleObserver& observer) {
  const model::DiffusionProcess process(bundle.schedules, bundle.architecture);
  const NetworkDenoiser denoiser(bundle, process, job.conditions.guidance,
                                 ResolveThreadCount(job.threads));
  return RunSamplingOn(bundle, process, denoiser, job, observer);
}

}  // namespace nucleate::sample
