// Dedup time and growth at 1k, 3k, 10k, 30k and 100k 20-atom structures of one composition (Mg4Al4O12).
// Workload (tests/unit/match/dedup_workload.h): 70 % distinct-but-similar variants of 5 random
// prototypes (strains of up to +-30 % and 0.4 A site moves, so lattices and sites of many pairs
// lie just beyond the tolerances), 20 % near-duplicates of earlier entries (3 % strain, up to 0.2 A
// site noise, rewritten: true matches) and 10 % exact duplicates (rotated, permuted, shifted).
// With set = many, the same recipe over 1,000 structure types (Variety::Many in that header).
// Prints time, structures per second, groups, pairwise matches run (pairs the lattice screen
// passed) and those of them that went on to the full site search (past the anchor screen), the
// growth exponents log(x2/x1)/log(n2/n1) of time and of both pair counts from the previous size,
// and the process's peak memory so far; sizes above max_n are skipped.
// With verify_n > 0 it first checks that the screened dedup of verify_n structures gives exactly
// the groups of the exhaustive comparison (DedupScreen::kFormulaOnly). Plain main: one timed run
// per size is the figure.
//   cmake --build build --target bench_dedup &&
//   build/tests/bench/bench_dedup [threads] [max_n] [verify_n] [crowded|many] [ltol,stol,angle]
#include <chrono>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <exception>
#include <vector>

#include "core/match/dedup.h"
#include "tests/unit/match/dedup_workload.h"
#include "tests/bench/peak_memory.h"

namespace {

namespace m = nucleate::match;

double Seconds(std::chrono::steady_clock::time_point since) {
  return std::chrono::duration<double>(std::chrono::steady_clock::now() - since).count();
}

double Exponent(double x2, double x1, double n2, double n1) {
  return std::log(x2 / x1) / std::log(n2 / n1);
}

int Run(int argc, char** argv) {
  const int threads = argc > 1 ? std::atoi(argv[1]) : 2;
  const int max_n = argc > 2 ? std::atoi(argv[2]) : 100000;
  const int verify_n = argc > 3 ? std::atoi(argv[3]) : 0;
  const bool many = argc > 4 && std::strcmp(argv[4], "many") == 0;
  if (argc > 4 && !many && std::strcmp(argv[4], "crowded") != 0) {
    std::fprintf(stderr, "bench_dedup: the set is crowded or many, not %s\n", argv[4]);
    return 2;
  }
  const m::testing::Variety variety = many ? m::testing::Variety::Many() : m::testing::Variety{};
  // Tolerances: the defaults, or "ltol,stol,angle" (the matcher's length, site and angle
  // tolerances).
  m::MatchTolerances tolerances;
  if (argc > 5 && std::sscanf(argv[5], "%lf,%lf,%lf", &tolerances.length_tolerance,
                              &tolerances.site_tolerance, &tolerances.angle_tolerance) != 3) {
    std::fprintf(stderr, "bench_dedup: tolerances are ltol,stol,angle, not %s\n", argv[5]);
    return 2;
  }
  std::printf("set: %s; tolerances: length %g, site %g, angle %g degrees\n",
              many ? "many (1,000 structure types)" : "crowded (5 structure types)",
              tolerances.length_tolerance, tolerances.site_tolerance, tolerances.angle_tolerance);
  if (verify_n > 0) {
    const auto structures = m::testing::DedupWorkload(7, variety).Make(verify_n);
    auto t0 = std::chrono::steady_clock::now();
    const auto screened = m::Deduplicate(structures, tolerances, threads);
    const double ts = Seconds(t0);
    t0 = std::chrono::steady_clock::now();
    const auto exhaustive =
        m::Deduplicate(structures, tolerances, threads, m::DedupScreen::kFormulaOnly);
    const double te = Seconds(t0);
    std::printf("verify n=%d: screened %zu groups (%lld matches, %.2f s), exhaustive %zu groups "
                "(%lld matches, %.2f s): %s\n",
                verify_n, screened.groups.size(), static_cast<long long>(screened.pairs_matched),
                ts, exhaustive.groups.size(), static_cast<long long>(exhaustive.pairs_matched), te,
                screened.groups == exhaustive.groups ? "IDENTICAL" : "DIFFERENT");
    std::fflush(stdout);
    if (screened.groups != exhaustive.groups) return 1;
  }
  double last_t = 0, last_pairs = 0, last_past = 0;
  int last_n = 0;
  for (int n : {1000, 3000, 10000, 30000, 100000}) {
    if (n > max_n) break;
    const auto structures = m::testing::DedupWorkload(42, variety).Make(n);
    const auto t0 = std::chrono::steady_clock::now();
    const auto r = m::Deduplicate(structures, tolerances, threads);
    const double t = Seconds(t0);
    const double pairs = static_cast<double>(r.pairs_matched);
    const double past = static_cast<double>(r.pairs_past_screens);
    std::printf("n=%6d threads=%d time %8.2f s  %7.0f structures/s  groups %6zu  pairwise matches "
                "%10.0f  past the anchor screen %8.0f",
                n, threads, t, n / t, r.groups.size(), pairs, past);
    if (last_n) {
      std::printf("  growth exponents: time %.2f, matches %.2f, past the screen %.2f",
                  Exponent(t, last_t, n, last_n), Exponent(pairs, last_pairs, n, last_n),
                  Exponent(past, last_past, n, last_n));
    }
    std::printf("  peak %.0f MB\n", nucleate::bench::PeakMemoryMb());
    std::fflush(stdout);
    last_t = t;
    last_pairs = pairs;
    last_past = past;
    last_n = n;
  }
  return 0;
}

}  // namespace

int main(int argc, char** argv) {
  try {
    return Run(argc, argv);
  } catch (const std::exception& e) {
    std::fprintf(stderr, "bench_dedup: %s\n", e.what());  // a bad tolerance, named
    return 2;
  }
}
