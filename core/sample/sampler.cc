#include "core/sample/sampler.h"

#include <algorithm>
#include <cmath>
#include <string>
#include <thread>

#include "core/common/parallel_for.h"
#include "core/model/diffusion.h"
#include "core/sample/network_denoiser.h"
#include "core/sample/reverse_levels.h"
#include "core/sample/reverse_step.h"
#include "core/sample/sample_setup.h"

namespace nucleate::sample {
namespace {

// Samples moved through the levels together: enough to keep every thread busy between two
// progress reports, few enough that cancelling loses little.
constexpr int kGroupPerThread = 4;

int ResolveThreads(int threads) {
  if (threads < 0) throw InvalidArgument("threads", "must be >= 0 (0 = every core)");
  if (threads == 0) return static_cast<int>(std::max(1u, std::thread::hardware_concurrency()));
  return threads;
}

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

SampleRun RunSamplingWith(const model::ModelBundle& bundle, const DenoisingFunction& denoiser,
                          const SampleJob& job, const SampleObserver& observer) {
  const int threads = ResolveThreads(job.threads);
  if (job.count < 1) throw InvalidArgument("count", "must be >= 1");
  if (static_cast<std::int64_t>(job.count) > job.limits.max_count) {
    throw LimitExceeded("limits.max_count", std::to_string(job.count) +
                                                " samples asked; the limit per call is " +
                                                std::to_string(job.limits.max_count));
  }
  if (static_cast<std::uint64_t>(job.first_index) + job.count - 1 > 0xffffffffull) {
    throw InvalidArgument("first_index", "first_index + count - 1 must stay below 2^32");
  }
  const model::DiffusionProcess process(bundle.schedules, bundle.architecture);
  ValidateSamplerSettings(job.sampler, process.steps());
  const std::vector<ReverseLevel> levels = BuildReverseLevels(process, job.sampler.steps);
  const SampleSetup setup(bundle, levels, job);
  const std::int64_t evaluations = EvaluationsPerSample(job, levels.size());
  if (evaluations > job.limits.max_evaluations) {
    throw LimitExceeded("limits.max_evaluations",
                        "each sample needs " + std::to_string(evaluations) +
                            " network evaluations; the limit is " +
                            std::to_string(job.limits.max_evaluations));
  }
  const std::int64_t bytes = EstimateSamplingBytes(bundle.architecture, setup.max_atoms(), threads, job.count);
  if (bytes > job.limits.max_memory_bytes) {
    throw LimitExceeded("limits.max_memory_bytes",
                        "the job needs about " + std::to_string(bytes >> 20) + " MiB; the limit is " +
                            std::to_string(job.limits.max_memory_bytes >> 20) + " MiB");
  }

  SampleRun run;
  const std::uint32_t group = static_cast<std::uint32_t>(kGroupPerThread * threads);
  std::int64_t done = 0;
  std::int64_t total = 0;
  {
    const SampleStart probe = setup.Start(job.first_index);
    total = static_cast<std::int64_t>(job.count) *
            static_cast<std::int64_t>(levels.size() - probe.first_level);
  }
  std::vector<Prediction> scratch(threads);
  for (std::uint32_t begin = 0; begin < job.count; begin += group) {
    const std::uint32_t size = std::min(group, job.count - begin);
    std::vector<SampleStart> starts(size);
    std::vector<SampleOutcome> outcomes(size);
    for (std::uint32_t j = 0; j < size; ++j) {
      outcomes[j].index = job.first_index + begin + j;
      starts[j] = setup.Start(outcomes[j].index);
    }
    const std::size_t first = starts.front().first_level;  // the same for every sample of a job
    for (std::size_t k = first; k < levels.size(); ++k) {
      ParallelFor(size, threads, [&](std::size_t j, int worker) {
        if (outcomes[j].error) return;
        try {
          ReverseStep(denoiser, job.sampler, levels, k, starts[j].constraints,
                      {job.seed, outcomes[j].index}, worker, &scratch[worker], &starts[j].state);
        } catch (const Error& e) {
          outcomes[j].error = e.WithinField("samples[" + std::to_string(outcomes[j].index) + "]");
        }
      });
      done += size;
      if (observer && !observer(done, total)) {
        run.cancelled = true;
        return run;
      }
    }
    for (std::uint32_t j = 0; j < size; ++j) {
      if (!outcomes[j].error) {
        try {
          outcomes[j].crystal = Finish(bundle, setup, starts[j], outcomes[j].index);
        } catch (const Error& e) {
          outcomes[j].error = e.WithinField("samples[" + std::to_string(outcomes[j].index) + "]");
        }
      }
      run.samples.push_back(std::move(outcomes[j]));
    }
    run.evaluations += evaluations * size;
  }
  return run;
}

SampleRun RunSampling(const model::ModelBundle& bundle, const SampleJob& job,
                      const SampleObserver& observer) {
  const model::DiffusionProcess process(bundle.schedules, bundle.architecture);
  const NetworkDenoiser denoiser(bundle, process, job.conditions.guidance, ResolveThreads(job.threads));
  return RunSamplingWith(bundle, denoiser, job, observer);
}

}  // namespace nucleate::sample
