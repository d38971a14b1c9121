// The dedup workload shared by the benchmark (tests/bench/bench_dedup.cc) and the screened-vs-
// exhaustive unit test: 20-atom structures of one composition (Mg4Al4O12) as a generator would
// emit them, so every hard case for a screen is present in bulk:
//  * distinct variants (70 %): one of 5 random prototypes, lattice strained by a random symmetric
//    strain of up to +-0.3 per component (mostly beyond the length and angle tolerances of any
//    other variant) and every site moved 0.4 A (0.18 of (V/N)^(1/3): within the site tolerance of
//    the prototype, so two variants of one prototype whose lattices agree may or may not match);
//  * near-duplicates (20 %): an earlier entry strained by up to +-0.03 per component and every
//    site moved by up to 0.2 A, then rotated, permuted and origin-shifted (true matches that are
//    not exact copies);
//  * exact duplicates (10 %): an earlier entry rotated, permuted and origin-shifted.
// That is the crowded set (Variety{}, the default). Variety::Many() is the same recipe spread over
// many structure types: 1,000 prototypes with axis ratios up to 3 and angles from 70 to 110
// degrees, each variant strained by up to +-0.05 (a generator proposing many distinct
// arrangements, each sampled a few times with small distortions).
#pragma once

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <random>
#include <vector>

#include <Eigen/Dense>

#include "core/structure/crystal.h"
#include "core/structure/lattice.h"

namespace nucleate::match::testing {

// How varied the distinct structures are.
struct Variety {
  int prototypes = 5;
  double strain = 0.3;                     // largest strain component of a distinct variant
  double axis_ratio = 2;                   // prototype axes from 1 to this, before scaling
  double angle_lo = 80, angle_hi = 100;    // prototype angles, degrees

  static Variety Many() { return {1000, 0.05, 3, 70, 110}; }
};

class DedupWorkload {
 public:
  explicit DedupWorkload(std::uint64_t seed, const Variety& variety = {})
      : rng_(seed), variety_(variety) {
    for (int k = 0; k < variety.prototypes; ++k) prototypes_.push_back(Prototype());
  }

  // `family` (optional) receives each structure's prototype index.
  std::vector<structure::Crystal> Make(int n, std::vector<int>* family = nullptr) {
    std::vector<structure::Crystal> out;
    std::vector<int> from;
    out.reserve(n);
    for (int i = 0; i < n; ++i) {
      const unsigned kind = i == 0 ? 0 : static_cast<unsigned>(rng_() % 10);
      if (kind < 7) {
        const int p = static_cast<int>(rng_() % prototypes_.size());
        out.push_back(Distort(prototypes_[p], variety_.strain, 0.4, false));
        from.push_back(p);
      } else {
        const std::size_t earlier = rng_() % out.size();
        out.push_back(kind < 9 ? Rewrite(Distort(out[earlier], 0.03, 0.2, true))
                               : Rewrite(out[earlier]));
        from.push_back(from[earlier]);
      }
    }
    if (family) *family = from;
    return out;
  }

 private:
  double Uniform(double lo, double hi) { return std::uniform_real_distribution<double>(lo, hi)(rng_); }

  structure::Crystal Prototype() {
    const double r = variety_.axis_ratio - 1, lo = variety_.angle_lo,
                 span = variety_.angle_hi - variety_.angle_lo;
    structure::LatticeParameters p{1 + Uniform(0, r), 1 + Uniform(0, r), 1 + Uniform(0, r),
                                   lo + Uniform(0, span), lo + Uniform(0, span),
                                   lo + Uniform(0, span)};
    structure::Crystal c;
    c.lattice = structure::MatrixFromParameters(p);
    c.lattice *= std::cbrt(20 * 11.0 / std::abs(c.lattice.determinant()));
    const int species[3] = {12, 13, 8};
    const int count[3] = {4, 4, 12};
    for (int s = 0; s < 3; ++s) {
      for (int k = 0; k < count[s]; ++k) {
        c.numbers.push_back(species[s]);
        c.frac.emplace_back(Uniform(0, 1), Uniform(0, 1), Uniform(0, 1));
      }
    }
    return c;
  }

  // Symmetric strain with components in [-strain, strain]; each site moved by `move` angstrom
  // (exactly, or up to, in a random direction).
  structure::Crystal Distort(const structure::Crystal& from, double strain, double move,
                             bool up_to) {
    structure::Crystal c = from;
    Eigen::Matrix3d e;
    for (int i = 0; i < 3; ++i)
      for (int j = 0; j < 3; ++j) e(i, j) = Uniform(-strain, strain);
    e = (e + e.transpose()) / 2;
    c.lattice = from.lattice * (Eigen::Matrix3d::Identity() + e).transpose();
    const Eigen::Matrix3d to_frac = c.lattice.transpose().inverse();
    for (auto& f : c.frac) {
      const Eigen::Vector3d d(Uniform(-1, 1), Uniform(-1, 1), Uniform(-1, 1));
      const double length = up_to ? move * Uniform(0, 1) : move;
      f = structure::WrapFractional(f + to_frac * (length * d.normalized()));
    }
    return c;
  }

  // The same crystal described differently: rotated frame, shuffled sites, shifted origin.
  structure::Crystal Rewrite(const structure::Crystal& c) {
    structure::Crystal d = c;
    const Eigen::Matrix3d r =
        Eigen::AngleAxisd(Uniform(0, 6.283),
                          Eigen::Vector3d(Uniform(0, 1), Uniform(0, 1), 1).normalized())
            .toRotationMatrix();
    d.lattice = c.lattice * r.transpose();
    const Eigen::Vector3d shift(Uniform(0, 1), Uniform(0, 1), Uniform(0, 1));
    std::vector<std::size_t> order(c.size());
    for (std::size_t i = 0; i < order.size(); ++i) order[i] = i;
    std::shuffle(order.begin(), order.end(), rng_);
    for (std::size_t i = 0; i < order.size(); ++i) {
      d.numbers[i] = c.numbers[order[i]];
      d.frac[i] = structure::WrapFractional(c.frac[order[i]] + shift);
    }
    return d;
  }

  std::mt19937_64 rng_;
  Variety variety_;
  std::vector<structure::Crystal> prototypes_;
};

}  // namespace nucleate::match::testing
