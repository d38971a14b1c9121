// Denoiser throughput for 64 cells of 20 atoms (the size issue 4 and 10 name): forward pass and
// training step (forward, loss, backward) in cells per second, their FLOP rate, that rate as a
// fraction of an Eigen float32 matrix product measured in the same run, graph building time, and
// the process's peak memory. Threads: work is split into micro-batches of 8 cells, as the trainer
// does. BM_ForwardScaling times one cell of 32 to 512 atoms (11 A^3 per atom) on one thread and
// prints microseconds per atom: from 64 atoms on the graph holds cutoff neighbours only, so the
// figure should stay about flat (cost linear in atoms; issue 10). Prints figures; asserts nothing.
//   cmake --build build --target bench_denoiser && build/tests/bench/bench_denoiser
#include <chrono>
#include <cmath>
#include <random>
#include <vector>

#include <benchmark/benchmark.h>

#include "core/common/parallel_for.h"
#include "core/model/denoiser.h"
#include "core/model/nn/parameters.h"
#include "core/train/loss.h"
#include "tests/bench/peak_memory.h"

namespace {

using namespace nucleate::model;
using nucleate::model::nn::Matrix;

constexpr int kCells = 64, kAtoms = 20, kMicro = 8;

Architecture BenchArchitecture() {
  Architecture a;  // defaults: hidden 128, 4 layers, K = 4, 16 radial functions
  a.elements = {3, 8, 9, 12, 13, 14, 16, 20, 22, 26, 29, 38};
  a.condition_composition = true;
  a.condition_crystal_system = true;
  return a;
}

std::vector<NoisyCell> Cells(const Architecture& a, int count, int first) {
  std::mt19937_64 rng(7);
  std::uniform_real_distribution<double> u(0, 1);
  std::vector<NoisyCell> out;
  for (int c = 0; c < count; ++c) {
    NoisyCell cell;
    cell.lattice << 6 + u(rng), 0, 0, u(rng), 6 + u(rng), 0, u(rng), u(rng), 6 + u(rng);
    for (double& f : cell.lattice_features) f = u(rng) - 0.5;
    for (int i = 0; i < kAtoms; ++i) {
      cell.frac.emplace_back(u(rng), u(rng), u(rng));
      cell.tokens.push_back(static_cast<int>((first + c + i) % a.elements.size()));
    }
    cell.time = 0.5;
    cell.conditions.composition.assign(a.elements.size(), 1.0 / a.elements.size());
    cell.conditions.crystal_system = 1 + c % 7;
    out.push_back(cell);
  }
  return out;
}

// The micro-batches of one 64-cell batch, built once.
struct Work {
  Architecture architecture = BenchArchitecture();
  Denoiser net{architecture};
  std::vector<float> weights = nn::Initialise<float>(net.layout(), 1);
  std::vector<GraphBatch<float>> micro;
  std::vector<DenoiserCache<float>> caches = std::vector<DenoiserCache<float>>(2);  // per worker
  std::vector<DenoiserOutput<float>> outputs = std::vector<DenoiserOutput<float>>(2);
  std::vector<DenoiserOutput<float>> gradients = std::vector<DenoiserOutput<float>>(2);
  double multiply_adds = 0;
  Work() {
    for (int m = 0; m < kCells / kMicro; ++m) {
      micro.push_back(BuildGraphBatch<float>(architecture, Cells(architecture, kMicro, m * kMicro)));
      multiply_adds += net.ForwardMultiplyAdds(micro.back().atoms(), micro.back().edges(), kMicro);
    }
  }
};

Work& Shared() {
  static Work work;
  return work;
}

// Single-thread Eigen float32 GEMM rate on the shape of the message product (edges x 128 x 128).
double GemmFlopRate() {
  static const double rate = [] {
    const int rows = kMicro * kAtoms * (kAtoms - 1), n = Shared().architecture.hidden;
    const Matrix<float> a = Matrix<float>::Random(rows, n), b = Matrix<float>::Random(n, n);
    Matrix<float> c(rows, n);
    c.noalias() = a * b;
    const int reps = 200;
    const auto t0 = std::chrono::steady_clock::now();
    for (int r = 0; r < reps; ++r) c.noalias() = a * b;
    const double t = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
    benchmark::DoNotOptimize(c.data());
    return 2.0 * rows * n * n * reps / t;
  }();
  return rate;
}

void Report(benchmark::State& state, double flops_per_batch, int threads) {
  state.counters["cells_per_s"] =
      benchmark::Counter(double(kCells), benchmark::Counter::kIsIterationInvariantRate);
  state.counters["GFLOP_per_s"] = benchmark::Counter(flops_per_batch / 1e9,
                                                     benchmark::Counter::kIsIterationInvariantRate);
  state.counters["gemm_GFLOP_per_s_per_thread"] = GemmFlopRate() / 1e9;
  state.counters["threads"] = threads;
  state.counters["peak_MB"] = nucleate::bench::PeakMemoryMb();
}

void BM_EigenGemmFloat32(benchmark::State& state) {
  for (auto _ : state) benchmark::DoNotOptimize(GemmFlopRate());
  state.counters["GFLOP_per_s"] = GemmFlopRate() / 1e9;
}
BENCHMARK(BM_EigenGemmFloat32)->Iterations(1);

void BM_BuildGraphs(benchmark::State& state) {
  Work& w = Shared();
  const auto cells = Cells(w.architecture, kCells, 0);
  for (auto _ : state) {
    for (int m = 0; m < kCells / kMicro; ++m) {
      const std::vector<NoisyCell> part(cells.begin() + m * kMicro, cells.begin() + (m + 1) * kMicro);
      benchmark::DoNotOptimize(BuildGraphBatch<float>(w.architecture, part).edges());
    }
  }
  state.counters["cells_per_s"] =
      benchmark::Counter(double(kCells), benchmark::Counter::kIsIterationInvariantRate);
}
BENCHMARK(BM_BuildGraphs)->Unit(benchmark::kMillisecond)->UseRealTime();

void BM_Forward(benchmark::State& state) {
  Work& w = Shared();
  const int threads = static_cast<int>(state.range(0));
  double seconds = 0;
  for (auto _ : state) {
    const auto t0 = std::chrono::steady_clock::now();
    nucleate::ParallelFor(w.micro.size(), threads, [&](std::size_t m, int worker) {
      DenoiserOutput<float>& out = w.outputs[worker];
      w.net.Forward<float>(w.micro[m], w.weights.data(), &out, &w.caches[worker]);
      benchmark::DoNotOptimize(out.coordinate_score.data());
    });
    seconds += std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
  }
  Report(state, 2 * w.multiply_adds, threads);
  // Forward FLOP rate / (same-run GEMM rate x threads): the 40 % target.
  const double rate = 2 * w.multiply_adds * double(state.iterations()) / seconds;
  state.counters["fraction_of_gemm_rate"] = rate / (GemmFlopRate() * threads);
}
BENCHMARK(BM_Forward)->Arg(1)->Arg(2)->Unit(benchmark::kMillisecond)->UseRealTime();

void BM_TrainingStep(benchmark::State& state) {
  Work& w = Shared();
  const int threads = static_cast<int>(state.range(0));
  std::vector<std::vector<float>> grads(w.micro.size(), std::vector<float>(w.weights.size()));
  for (auto _ : state) {
    nucleate::ParallelFor(w.micro.size(), threads, [&](std::size_t m, int worker) {
      const GraphBatch<float>& b = w.micro[m];
      DenoiserOutput<float>& out = w.outputs[worker];
      DenoiserOutput<float>& d = w.gradients[worker];
      DenoiserCache<float>& cache = w.caches[worker];
      w.net.Forward<float>(b, w.weights.data(), &out, &cache);
      nucleate::train::BatchTargets<float> targets;
      targets.coordinate_score = Matrix<float>::Zero(b.atoms(), 3);
      targets.lattice_noise = Matrix<float>::Zero(b.cells, 6);
      nucleate::train::BatchLoss(b, out, targets, {}, &d);
      std::fill(grads[m].begin(), grads[m].end(), 0.0f);
      w.net.Backward<float>(b, w.weights.data(), cache, d, grads[m].data());
    });
  }
  // Backward costs about two forward passes (input and weight gradients of every product).
  Report(state, 3 * 2 * w.multiply_adds, threads);
}
BENCHMARK(BM_TrainingStep)->Arg(1)->Arg(2)->Unit(benchmark::kMillisecond)->UseRealTime();

// One cell of n atoms at 11 A^3 per atom (a nearly cubic box, random sites).
NoisyCell CellOfAtoms(const Architecture& a, int n) {
  std::mt19937_64 rng(11);
  std::uniform_real_distribution<double> u(0, 1);
  NoisyCell cell;
  const double side = std::cbrt(11.0 * n);
  cell.lattice << side, 0, 0, 0.1 * u(rng), side, 0, 0.1 * u(rng), 0.1 * u(rng), side;
  for (double& f : cell.lattice_features) f = u(rng) - 0.5;
  for (int i = 0; i < n; ++i) {
    cell.frac.emplace_back(u(rng), u(rng), u(rng));
    cell.tokens.push_back(static_cast<int>(i % a.elements.size()));
  }
  cell.time = 0.5;
  cell.conditions.composition.assign(a.elements.size(), 1.0 / a.elements.size());
  cell.conditions.crystal_system = 1;
  return cell;
}

void BM_ForwardScaling(benchmark::State& state) {
  Work& w = Shared();
  const int n = static_cast<int>(state.range(0));
  const GraphBatch<float> batch = BuildGraphBatch<float>(w.architecture, {CellOfAtoms(w.architecture, n)});
  double seconds = 0;
  for (auto _ : state) {
    const auto t0 = std::chrono::steady_clock::now();
    w.net.Forward<float>(batch, w.weights.data(), &w.outputs[0], &w.caches[0]);
    benchmark::DoNotOptimize(w.outputs[0].coordinate_score.data());
    seconds += std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
  }
  state.counters["atoms"] = n;
  state.counters["edges_per_atom"] = double(batch.edges()) / n;
  state.counters["us_per_atom"] = 1e6 * seconds / double(state.iterations()) / n;
}
BENCHMARK(BM_ForwardScaling)->RangeMultiplier(2)->Range(32, 512)->Unit(benchmark::kMillisecond);

}  // namespace

BENCHMARK_MAIN();
