// Lattice vectors shorter than a radius, and the shortest basis of a lattice built from them.
#pragma once

#include <vector>

#include <Eigen/Dense>

namespace nucleate::match {

// Enumerating more points than this is refused (LimitExceeded on "lattice"): it only happens for a
// radius many times the cell size, e.g. a supercell search of a huge index.
constexpr long kMaxLatticePoints = 2000000;

struct LatticePoint {
  Eigen::Vector3i coefficients = Eigen::Vector3i::Zero();  // in the rows of the lattice
  Eigen::Vector3d cartesian = Eigen::Vector3d::Zero();
  double length = 0;
};

// Every non-zero n * lattice with length <= radius, sorted by length (ties by coefficients, so
// the order never depends on rounding of the search). Exact for any basis: |n_k| <= radius * |b_k|
// with b_k the reciprocal rows bounds the search; a reduced basis only keeps it small.
std::vector<LatticePoint> LatticePointsWithin(const Eigen::Matrix3d& lattice, double radius);

// The same into *points (replaced), reusing its storage.
void LatticePointsWithin(const Eigen::Matrix3d& lattice, double radius,
                         std::vector<LatticePoint>* points);

// A basis of the same lattice made of the shortest vectors: its lengths are the successive minima
// (in three dimensions vectors realising the successive minima always form a basis, so this is a
// Buerger-reduced cell). Right-handed. `transform` (optional) receives the integer matrix with
// result = transform * lattice.
Eigen::Matrix3d ShortestBasis(const Eigen::Matrix3d& lattice, Eigen::Matrix3i* transform = nullptr);

}  // namespace nucleate::match
