// Dedup time and growth at 1k, 3k, 10k, 30k and 100k 20-atom structures of one composition (Mg4Al4O12).
// Workload (tests/unit/match/dedup_workload.h): 70 % distinct-but-similar variants of 5 random
// prototypes (strains of up to +-30 % and 0.4 A site moves, so lattices and sites of many pairs
// lie just beyond the tolerances), 20 % near-duplicates of earlier entries (3 % strain, up to 0.2 A
// site noise, rewritten: true matches) and 10 % exact duplicates (rotated, permuted, shifted).
// Prints time, structures per second, groups, pairwise matches run, the growth exponent
// log(t2/t1)/log(n2/n1) from the previous size, and the process's peak memory so far; sizes above
// max_n are skipped.
// With verify_n > 0 it first checks that the screened dedup of verify_n structures gives exactly
// the groups of the exhaustive comparison (DedupScreen::kFormulaOnly). Plain main: one timed run
// per size is the figure.
//   cmake --build build --target bench_dedup && build/tests/bench/bench_dedup [threads] [max_n] [verify_n]
#include <chrono>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <vector>

#include "core/match/dedup.h"
#include "tests/unit/match/dedup_workload.h"
#include "tests/bench/peak_memory.h"

namespace {

namespace m = nucleate::match;

double Seconds(std::chrono::steady_clock::time_point since) {
  return std::chrono::duration<double>(std::chrono::steady_clock::now() - since).count();
}

}  // namespace

int main(int argc, char** argv) {
  const int threads = argc > 1 ? std::atoi(argv[1]) : 2;
  const int max_n = argc > 2 ? std::atoi(argv[2]) : 100000;
  const int verify_n = argc > 3 ? std::atoi(argv[3]) : 0;
  if (verify_n > 0) {
    const auto structures = m::testing::DedupWorkload(7).Make(verify_n);
    auto t0 = std::chrono::steady_clock::now();
    const auto screened = m::Deduplicate(structures, m::MatchTolerances{}, threads);
    const double ts = Seconds(t0);
    t0 = std::chrono::steady_clock::now();
    const auto exhaustive =
        m::Deduplicate(structures, m::MatchTolerances{}, threads, m::DedupScreen::kFormulaOnly);
    const double te = Seconds(t0);
    std::printf("verify n=%d: screened %zu groups (%lld matches, %.2f s), exhaustive %zu groups "
                "(%lld matches, %.2f s): %s\n",
                verify_n, screened.groups.size(), static_cast<long long>(screened.pairs_matched),
                ts, exhaustive.groups.size(), static_cast<long long>(exhaustive.pairs_matched), te,
                screened.groups == exhaustive.groups ? "IDENTICAL" : "DIFFERENT");
    std::fflush(stdout);
    if (screened.groups != exhaustive.groups) return 1;
  }
  double last_t = 0;
  int last_n = 0;
  for (int n : {1000, 3000, 10000, 30000, 100000}) {
    if (n > max_n) break;
    const auto structures = m::testing::DedupWorkload(42).Make(n);
    const auto t0 = std::chrono::steady_clock::now();
    const auto r = m::Deduplicate(structures, m::MatchTolerances{}, threads);
    const double t = Seconds(t0);
    std::printf("n=%6d threads=%d time %8.2f s  %7.0f structures/s  groups %6zu  pairwise matches "
                "%10lld",
                n, threads, t, n / t, r.groups.size(), static_cast<long long>(r.pairs_matched));
    if (last_n) std::printf("  growth exponent %.2f", std::log(t / last_t) / std::log(double(n) / last_n));
    std::printf("  peak %.0f MB\n", nucleate::bench::PeakMemoryMb());
    std::fflush(stdout);
    last_t = t;
    last_n = n;
  }
  return 0;
}
