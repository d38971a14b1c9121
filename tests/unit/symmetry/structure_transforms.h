// Symmetry-preserving rewrites of a crystal (a rotated frame, shifted origin, permuted atoms,
// supercells) and a seeded perturbation, shared by the unit tests and the reference dump.
#pragma once

#include <cstdint>
#include <random>

#include <Eigen/Dense>

#include "core/structure/crystal.h"

namespace nucleate::symmetry::testing {

// Cartesian rotation of the whole crystal: rows L -> L R^T (fractional coordinates unchanged).
structure::Crystal RotateFrame(const structure::Crystal& c, const Eigen::Matrix3d& rotation);
// Rotation by `angle` radians about `axis` (normalised here).
Eigen::Matrix3d AxisAngle(const Eigen::Vector3d& axis, double angle);
// Every atom shifted by the same fractional vector, then wrapped.
structure::Crystal Translate(const structure::Crystal& c, const Eigen::Vector3d& shift);
// Atoms reordered by a seeded shuffle.
structure::Crystal Permute(const structure::Crystal& c, std::uint64_t seed);
// Supercell with rows L' = M L for an integer matrix M with det(M) > 0; all images included.
structure::Crystal Supercell(const structure::Crystal& c, const Eigen::Matrix3i& m);
// Each atom moved by a random Cartesian vector of length `amplitude` angstrom (seeded).
structure::Crystal Perturb(const structure::Crystal& c, double amplitude, std::uint64_t seed);

// Uniform doubles in [0, 1) from std::mt19937_64 bits: identical on every standard library
// (std::uniform_real_distribution is not).
class Uniform {
 public:
  explicit Uniform(std::uint64_t seed) : engine_(seed) {}
  double Next() { return static_cast<double>(engine_() >> 11) * 0x1.0p-53; }
  int Below(int n) { return static_cast<int>(Next() * n); }

 private:
  std::mt19937_64 engine_;
};

}  // namespace nucleate::symmetry::testing
