// Small textbook crystals and random cells for the structure and checks tests.
#pragma once

#include <cmath>
#include <random>
#include <vector>

#include <Eigen/Dense>

#include "core/structure/crystal.h"

namespace nucleate::testing {

inline structure::Crystal MakeCrystal(const Eigen::Matrix3d& lattice, std::vector<int> numbers,
                                      std::vector<Eigen::Vector3d> frac) {
  structure::Crystal c;
  c.lattice = lattice;
  c.numbers = std::move(numbers);
  c.frac = std::move(frac);
  return c;
}

inline Eigen::Matrix3d Cubic(double a) { return a * Eigen::Matrix3d::Identity(); }

// Rock salt AB in the conventional cubic cell: A at the fcc sites, B shifted by (1/2, 0, 0).
inline structure::Crystal RockSalt(int a_number, int b_number, double a) {
  const std::vector<Eigen::Vector3d> fcc = {{0, 0, 0}, {0, 0.5, 0.5}, {0.5, 0, 0.5}, {0.5, 0.5, 0}};
  structure::Crystal c;
  c.lattice = Cubic(a);
  for (const auto& p : fcc) {
    c.numbers.push_back(a_number);
    c.frac.push_back(p);
  }
  for (const auto& p : fcc) {
    c.numbers.push_back(b_number);
    c.frac.push_back((p + Eigen::Vector3d(0.5, 0, 0)).unaryExpr([](double x) { return x - std::floor(x); }));
  }
  return c;
}

// Diamond structure (8 atoms, conventional cubic cell).
inline structure::Crystal Diamond(int number, double a) {
  const std::vector<Eigen::Vector3d> fcc = {{0, 0, 0}, {0, 0.5, 0.5}, {0.5, 0, 0.5}, {0.5, 0.5, 0}};
  structure::Crystal c;
  c.lattice = Cubic(a);
  for (const auto& p : fcc) {
    c.numbers.push_back(number);
    c.frac.push_back(p);
    c.numbers.push_back(number);
    c.frac.push_back(p + Eigen::Vector3d(0.25, 0.25, 0.25));
  }
  return c;
}

// A lattice with given lengths and angles (degrees), rotated arbitrarily so nothing depends on the
// standard orientation.
inline Eigen::Matrix3d SkewedLattice(double a, double b, double c, double alpha, double beta,
                                     double gamma, double rotation = 0.3) {
  const double d = 3.14159265358979323846 / 180;
  const double ca = std::cos(alpha * d), cb = std::cos(beta * d), cg = std::cos(gamma * d);
  const double sg = std::sin(gamma * d);
  const double cy = (ca - cb * cg) / sg;
  Eigen::Matrix3d m;
  m << a, 0, 0, b * cg, b * sg, 0, c * cb, c * cy, c * std::sqrt(1 - cb * cb - cy * cy);
  const Eigen::Matrix3d rot =
      Eigen::AngleAxisd(rotation, Eigen::Vector3d(1, 2, 3).normalized()).toRotationMatrix();
  return m * rot.transpose();
}

// The shortest |(fj - fi + n) L| over every n in [-range, range]^3: a brute-force reference.
inline double BruteForceDistance(const Eigen::Matrix3d& lattice, const Eigen::Vector3d& fi,
                                 const Eigen::Vector3d& fj, int range, bool exclude_zero = false) {
  double best = INFINITY;
  for (int x = -range; x <= range; ++x) {
    for (int y = -range; y <= range; ++y) {
      for (int z = -range; z <= range; ++z) {
        if (exclude_zero && x == 0 && y == 0 && z == 0) continue;
        const Eigen::Vector3d f = fj - fi + Eigen::Vector3d(x, y, z);
        best = std::min(best, (lattice.transpose() * f).norm());
      }
    }
  }
  return best;
}

// Images needed along each axis for a vector of length up to r: |n_k| <= r |b_k| + 1, b_k the
// reciprocal rows (planes 1/|b_k| apart). Used to prove the brute-force range sufficient.
inline int ImagesNeeded(const Eigen::Matrix3d& lattice, double r) {
  const Eigen::Matrix3d recip = lattice.inverse().transpose();
  int needed = 0;
  for (int k = 0; k < 3; ++k) {
    needed = std::max(needed, static_cast<int>(std::ceil(r * recip.row(k).norm())) + 1);
  }
  return needed;
}

inline structure::Crystal RandomCrystal(std::mt19937_64& rng, const Eigen::Matrix3d& lattice,
                                        int sites) {
  std::uniform_real_distribution<double> u(0, 1);
  std::uniform_int_distribution<int> z(1, 90);
  structure::Crystal c;
  c.lattice = lattice;
  for (int s = 0; s < sites; ++s) {
    c.numbers.push_back(z(rng));
    c.frac.emplace_back(u(rng), u(rng), u(rng));
  }
  return c;
}

}  // namespace nucleate::testing
