// Validity checks per second on 20-atom cells: the figure that says whether checking every
// generated candidate is free next to sampling. Prints "checks_per_second" and the process's peak
// memory ("peak_MB"); asserts nothing.
#include <random>
#include <vector>

#include <benchmark/benchmark.h>

#include "core/checks/validity.h"
#include "tests/unit/structure/crystal_builders.h"
#include "tests/bench/peak_memory.h"

namespace {

using nucleate::structure::Crystal;

// SrTiO3 cubic perovskite (a = 3.905 A, from memory), 2 x 2 x 1 supercell: 20 atoms, valid.
Crystal Perovskite20() {
  const std::vector<std::pair<int, Eigen::Vector3d>> unit = {
      {38, {0, 0, 0}}, {22, {0.5, 0.5, 0.5}}, {8, {0.5, 0.5, 0}}, {8, {0.5, 0, 0.5}}, {8, {0, 0.5, 0.5}}};
  Crystal c;
  c.lattice = Eigen::Vector3d(7.81, 7.81, 3.905).asDiagonal();
  for (int x = 0; x < 2; ++x) {
    for (int y = 0; y < 2; ++y) {
      for (const auto& [z, f] : unit) {
        c.numbers.push_back(z);
        c.frac.push_back(Eigen::Vector3d((f[0] + x) / 2, (f[1] + y) / 2, f[2]));
      }
    }
  }
  return c;
}

// Random 20-atom candidates in skewed cells at ~15 A^3 per atom, like an untrained generator's.
std::vector<Crystal> RandomCandidates(int count) {
  std::mt19937_64 rng(42);
  std::uniform_real_distribution<double> angle(60, 120), length(5.0, 9.0);
  const int species[] = {3, 8, 12, 14, 16, 22, 26, 29, 38, 56};
  std::uniform_int_distribution<int> pick(0, 9);
  std::vector<Crystal> out;
  while (static_cast<int>(out.size()) < count) {
    const Eigen::Matrix3d lattice = nucleate::testing::SkewedLattice(
        length(rng), length(rng), length(rng), angle(rng), angle(rng), angle(rng));
    if (!lattice.allFinite()) continue;
    Crystal c = nucleate::testing::RandomCrystal(rng, lattice, 20);
    for (int& z : c.numbers) z = species[pick(rng)];
    out.push_back(c);
  }
  return out;
}

void BM_CheckValidityPerovskite20(benchmark::State& state) {
  const Crystal c = Perovskite20();
  for (auto _ : state) benchmark::DoNotOptimize(nucleate::checks::CheckValidity(c));
  state.counters["checks_per_second"] =
      benchmark::Counter(static_cast<double>(state.iterations()), benchmark::Counter::kIsRate);
  state.counters["peak_MB"] = nucleate::bench::PeakMemoryMb();
}
BENCHMARK(BM_CheckValidityPerovskite20);

void BM_CheckValidityRandom20(benchmark::State& state) {
  const std::vector<Crystal> candidates = RandomCandidates(256);
  std::size_t k = 0;
  for (auto _ : state) {
    benchmark::DoNotOptimize(nucleate::checks::CheckValidity(candidates[k++ % candidates.size()]));
  }
  state.counters["checks_per_second"] =
      benchmark::Counter(static_cast<double>(state.iterations()), benchmark::Counter::kIsRate);
  state.counters["peak_MB"] = nucleate::bench::PeakMemoryMb();
}
BENCHMARK(BM_CheckValidityRandom20);

}  // namespace

BENCHMARK_MAIN();
