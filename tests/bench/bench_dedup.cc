// Dedup time at 1k, 10k and 100k 20-atom structures of one composition (Mg4Al8O8... written
// A4B4C12 below): mostly distinct variants of a few prototypes (random lattice strain and site
// noise, so most pairs differ beyond tolerance) plus exact duplicates (rotated, permuted,
// origin-shifted copies of earlier entries, about 10 %). Prints time, groups, pairwise matches and
// the growth exponent log(t2/t1)/log(n2/n1). Plain main: one timed run per size is the figure.
//   cmake --build build --target bench_dedup && build/tests/bench/bench_dedup [threads] [max_n]
#include <chrono>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <random>
#include <vector>

#include <Eigen/Dense>

#include "core/match/dedup.h"
#include "core/structure/crystal.h"
#include "core/structure/lattice.h"

namespace {

using nucleate::structure::Crystal;

Crystal Prototype(std::mt19937_64& rng) {
  std::uniform_real_distribution<double> u(0, 1);
  nucleate::structure::LatticeParameters p{1 + u(rng), 1 + u(rng), 1 + u(rng),
                                           80 + 20 * u(rng), 80 + 20 * u(rng), 80 + 20 * u(rng)};
  Crystal c;
  c.lattice = nucleate::structure::MatrixFromParameters(p);
  c.lattice *= std::cbrt(20 * 11.0 / std::abs(c.lattice.determinant()));
  const int species[3] = {12, 13, 8};
  const int count[3] = {4, 4, 12};
  for (int s = 0; s < 3; ++s) {
    for (int k = 0; k < count[s]; ++k) {
      c.numbers.push_back(species[s]);
      c.frac.emplace_back(u(rng), u(rng), u(rng));
    }
  }
  return c;
}

// A distinct variant: lattice strained by up to +-30 % per component, sites moved by 0.4 A.
Crystal Variant(const Crystal& proto, std::mt19937_64& rng) {
  std::uniform_real_distribution<double> u(-1, 1);
  Crystal c = proto;
  Eigen::Matrix3d e;
  for (int i = 0; i < 3; ++i)
    for (int j = 0; j < 3; ++j) e(i, j) = 0.3 * u(rng);
  e = (e + e.transpose()) / 2;
  c.lattice = proto.lattice * (Eigen::Matrix3d::Identity() + e).transpose();
  const Eigen::Matrix3d to_frac = c.lattice.transpose().inverse();
  for (auto& f : c.frac) {
    const Eigen::Vector3d d(u(rng), u(rng), u(rng));
    f = nucleate::structure::WrapFractional(f + to_frac * (0.4 * d.normalized()));
  }
  return c;
}

// An exact duplicate of `c` described differently: rotated frame, shuffled sites, shifted origin.
Crystal Duplicate(const Crystal& c, std::mt19937_64& rng) {
  std::uniform_real_distribution<double> u(0, 1);
  Crystal d = c;
  const Eigen::Matrix3d r =
      Eigen::AngleAxisd(6.283 * u(rng), Eigen::Vector3d(u(rng), u(rng), 1).normalized())
          .toRotationMatrix();
  d.lattice = c.lattice * r.transpose();
  const Eigen::Vector3d shift(u(rng), u(rng), u(rng));
  std::vector<std::size_t> order(c.size());
  for (std::size_t i = 0; i < order.size(); ++i) order[i] = i;
  std::shuffle(order.begin(), order.end(), rng);
  for (std::size_t i = 0; i < order.size(); ++i) {
    d.numbers[i] = c.numbers[order[i]];
    d.frac[i] = nucleate::structure::WrapFractional(c.frac[order[i]] + shift);
  }
  return d;
}

std::vector<Crystal> Make(int n, std::uint64_t seed) {
  std::mt19937_64 rng(seed);
  std::vector<Crystal> protos;
  for (int k = 0; k < 5; ++k) protos.push_back(Prototype(rng));
  std::vector<Crystal> out;
  out.reserve(n);
  for (int i = 0; i < n; ++i) {
    if (i > 0 && rng() % 10 == 0) {
      out.push_back(Duplicate(out[rng() % out.size()], rng));
    } else {
      out.push_back(Variant(protos[rng() % protos.size()], rng));
    }
  }
  return out;
}

}  // namespace

int main(int argc, char** argv) {
  const int threads = argc > 1 ? std::atoi(argv[1]) : 2;
  const int max_n = argc > 2 ? std::atoi(argv[2]) : 100000;
  double last_t = 0;
  int last_n = 0;
  for (int n : {1000, 10000, 100000}) {
    if (n > max_n) break;
    const auto structures = Make(n, 42);
    const auto t0 = std::chrono::steady_clock::now();
    const auto r = nucleate::match::Deduplicate(structures, nucleate::match::MatchTolerances{},
                                                threads);
    const double t = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
    std::printf("n=%6d threads=%d time %8.2f s  groups %6zu  pairwise matches %10lld", n, threads,
                t, r.groups.size(), static_cast<long long>(r.pairs_matched));
    if (last_n) std::printf("  growth exponent %.2f", std::log(t / last_t) / std::log(double(n) / last_n));
    std::printf("\n");
    std::fflush(stdout);
    last_t = t;
    last_n = n;
  }
  return 0;
}
