// Sampling throughput for 20-atom cells (4 formula units of SrTiO3) with a network of the default
// size (hidden 128, 4 layers) and random weights: candidates per second at 100 and 1000 steps on
// 1 and 2 threads, the share of wall time spent outside network evaluation (the target:
// under 5 %), the network's FLOP rate over the whole run, the job's memory estimate for 1000 such
// candidates, and peak memory. Network
// evaluation is timed around each Predict call (graph building, forward pass, output copy).
// Prints figures; asserts nothing.
//   cmake --build build --target bench_sample && build/tests/bench/bench_sample
#include <atomic>
#include <chrono>
#include <vector>

#include <benchmark/benchmark.h>

#include "core/model/denoiser.h"
#include "core/model/diffusion.h"
#include "core/model/lattice_features.h"
#include "core/model/nn/parameters.h"
#include "core/sample/network_denoiser.h"
#include "core/sample/sampler.h"
#include "tests/bench/peak_memory.h"

namespace {

using namespace nucleate;

model::ModelBundle BenchBundle() {
  model::ModelBundle b;
  b.architecture.elements = {8, 22, 38};  // defaults otherwise: hidden 128, 4 layers
  b.schedules = model::DefaultModelSchedules();
  b.schedules.species.num_classes = b.architecture.species_tokens();
  // Statistics around a cubic 20-atom cell of 7.8 A (2 x 2 x 1 perovskite-like cells of 3.9 A
  // would hold 20 atoms; the exact shape does not matter for timing).
  Eigen::Matrix3d cell = Eigen::Matrix3d::Identity() * 5.5;
  const model::LatticeFeatures mean = model::LatticeToFeatures(cell, 20);
  for (int k = 0; k < 6; ++k) {
    b.normalisation.lattice_mean[k] = mean[k];
    b.normalisation.lattice_std[k] = 0.2;
  }
  b.atom_counts.overall.assign(21, 0);
  b.atom_counts.overall[20] = 1;
  const model::Denoiser net(b.architecture);
  b.layout = net.layout();
  b.values = model::nn::Initialise<float>(b.layout, 3);
  return b;
}

const model::ModelBundle& Bundle() {
  static const model::ModelBundle b = BenchBundle();
  return b;
}

// The network denoiser with a stopwatch around each evaluation, per worker, which also counts the
// network's multiply-adds (one cell per evaluation; cells of this benchmark are below the
// cutoff_from_atoms size, so every ordered pair of atoms is an edge).
class TimedDenoiser : public sample::DenoisingFunction {
 public:
  TimedDenoiser(const sample::DenoisingFunction& inner, int workers)
      : inner_(inner), seconds_(workers), multiply_adds_(workers) {}
  void Predict(const sample::ChainState& s, long long t, int worker,
               sample::Prediction* out) const override {
    const auto t0 = std::chrono::steady_clock::now();
    inner_.Predict(s, t, worker, out);
    seconds_[worker] += std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
    const int atoms = static_cast<int>(s.frac.size());
    multiply_adds_[worker] += net_.ForwardMultiplyAdds(atoms, atoms * (atoms - 1), 1);
  }
  double multiply_adds() const {
    double sum = 0;
    for (double m : multiply_adds_) sum += m;
    return sum;
  }
  int mask_token() const override { return inner_.mask_token(); }
  double total() const {
    double sum = 0;
    for (double s : seconds_) sum += s;
    return sum;
  }

 private:
  const sample::DenoisingFunction& inner_;
  const model::Denoiser net_{Bundle().architecture};
  mutable std::vector<double> seconds_;  // one slot per worker: no sharing
  mutable std::vector<double> multiply_adds_;
};

void BM_Sample(benchmark::State& state) {
  const long long steps = state.range(0);
  const int threads = static_cast<int>(state.range(1));
  sample::SampleJob job;
  job.task = sample::TaskKind::kComposition;
  job.composition.formula = {{38, 1}, {22, 1}, {8, 3}};
  job.composition.min_units = job.composition.max_units = 4;
  job.sampler.steps = steps;
  job.count = static_cast<std::uint32_t>(4 * threads);  // one group: every thread busy
  job.threads = threads;
  const model::DiffusionProcess process(Bundle().schedules, Bundle().architecture);
  const sample::NetworkDenoiser network(Bundle(), process, 1.0, threads);
  double wall = 0, inside = 0, multiply_adds = 0;
  std::int64_t candidates = 0;
  for (auto _ : state) {
    const TimedDenoiser timed(network, threads);
    const auto t0 = std::chrono::steady_clock::now();
    const sample::SampleRun run = sample::RunSamplingWith(Bundle(), timed, job);
    wall += std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
    inside += timed.total();
    multiply_adds += timed.multiply_adds();
    candidates += static_cast<std::int64_t>(run.samples.size());
  }
  state.counters["candidates_per_s"] = candidates / wall;
  state.counters["steps"] = static_cast<double>(steps);
  state.counters["threads"] = threads;
  state.counters["outside_network_share"] = 1.0 - inside / (wall * threads);
  state.counters["network_GFLOP_per_s"] = 2 * multiply_adds / wall / 1e9;
  state.counters["peak_MB"] = nucleate::bench::PeakMemoryMb();
  state.counters["estimate_1000_candidates_MB"] =
      sample::EstimateSamplingBytes(Bundle().architecture, 20, threads, 1000) / 1048576.0;
}
BENCHMARK(BM_Sample)
    ->Args({100, 1})
    ->Args({100, 2})
    ->Args({1000, 1})
    ->Args({1000, 2})
    ->Iterations(1)
    ->Unit(benchmark::kSecond)
    ->UseRealTime();

}  // namespace

BENCHMARK_MAIN();
