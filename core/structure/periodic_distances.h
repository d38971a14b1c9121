// Distances in a periodic crystal: minimum image, distance matrix, shortest interatomic distance
// (an atom to its own periodic image included). Cutoff neighbour lists are in neighbor_list.h. Right for any cell,
// however skewed: every search runs on an LLL-reduced basis (lattice_reduction.h) and visits every
// image allowed by a proven bound (see periodic_distances.cc), not a fixed 27.
#pragma once

#include <cstddef>
#include <cstdint>

#include <Eigen/Dense>

#include "core/structure/crystal.h"
#include "core/structure/lattice_reduction.h"

namespace nucleate::structure {

// DistanceMatrix refuses more sites than this (LimitExceeded on "atomic_numbers"): 72 MB of doubles.
constexpr std::int64_t kMaxDistanceMatrixSites = 3000;

// One shortest periodic vector: vector = (frac_j + image - frac_i) * lattice.
struct ImageVector {
  double distance = 0;
  Eigen::Vector3d vector = Eigen::Vector3d::Zero();  // Cartesian angstrom, from i to j's image
  Eigen::Vector3i image = Eigen::Vector3i::Zero();   // in the caller's cell basis
};

// Minimum-image searches for one lattice; build once, ask many times.
class MinimumImage {
 public:
  // Raises InvalidArgument for a non-finite or singular lattice.
  explicit MinimumImage(const Eigen::Matrix3d& lattice);

  // The shortest of all (frac_j - frac_i + n) * lattice over integer n. frac need not be wrapped.
  ImageVector Between(const Eigen::Vector3d& frac_i, const Eigen::Vector3d& frac_j) const;
  // A lower bound on Between(frac_i, frac_j).distance, for skipping pairs that cannot beat a
  // known distance: every image x has |x| >= |g_k| / |b_k| on each reduced axis k (see
  // periodic_distances.cc), and |g_k| is at least the wrapped component. Widened by 1e-9 (relative)
  // against rounding, so Between never returns less.
  double LowerBound(const Eigen::Vector3d& frac_i, const Eigen::Vector3d& frac_j) const;
  // The shortest non-zero lattice vector: the distance from any atom to its own nearest image.
  const ImageVector& ShortestLatticeVector() const { return shortest_; }

  const ReducedLattice& reduced() const { return reduced_; }

 private:
  ImageVector Search(const Eigen::Vector3d& frac_delta, bool exclude_zero) const;
  // frac_delta in reduced fractions, wrapped to [-1/2, 1/2] per component by adding *shift
  // (integers): the start of Search and of LowerBound.
  Eigen::Vector3d WrappedReduced(const Eigen::Vector3d& frac_delta, Eigen::Vector3d* shift) const;

  Eigen::Matrix3d lattice_;
  ReducedLattice reduced_;
  Eigen::Matrix3d to_reduced_;      // reduced fractional = to_reduced_ * fractional
  Eigen::Vector3d reciprocal_norms_;  // |b'_k| of the reduced lattice
  // The enumeration order (shortest reduced vector innermost) and the triangular factor R of the
  // reduced vectors taken in that order as columns: see periodic_distances.cc.
  Eigen::Vector3i order_;
  Eigen::Matrix3d triangle_;
  ImageVector shortest_;
};

// N x N minimum-image distances; the diagonal is 0 (an atom's own images are not on it: see
// MinimumInteratomicDistance). Validates the crystal against `limits`.
Eigen::MatrixXd DistanceMatrix(const Crystal& crystal, const StructureLimits& limits = {});

// The shortest distance between any two sites, or between a site and its own periodic image when
// that is shorter (one atom in a small cell). i <= j; i == j means the self-image.
struct ClosestPair {
  double distance = 0;
  std::size_t i = 0, j = 0;
  Eigen::Vector3i image = Eigen::Vector3i::Zero();
};
ClosestPair MinimumInteratomicDistance(const Crystal& crystal, const StructureLimits& limits = {});

}  // namespace nucleate::structure
