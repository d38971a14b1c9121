// The image bound. Write a periodic vector as x = g * L (row g of reduced fractional coordinates,
// L the reduced lattice) and let B be the reciprocal lattice (rows b_k, a_i . b_k = delta_ik).
// Then g_k = x . b_k, so |g_k| <= |x| |b_k|. If some candidate image has length r0, every image at
// least as short has |g_k| <= r0 |b_k| along each axis k: enumerating those integer offsets finds
// the true minimum for any lattice. Reducing the lattice first only keeps r0 |b_k| small.
//
// Inside that box only the offsets within the sphere of radius r0 are visited (Fincke-Pohst
// enumeration): with the reduced vectors as columns C = Q R (R upper triangular), |x|^2 is
// sum_i (R_ii z_i + sum_{j>i} R_ij z_j)^2, so once the outer coordinates are chosen each inner one
// lies in an interval. The longest vector is outermost. Without this, a long thin cell (a 500 A
// axis beside 1 A axes) has r0 |b_k| of hundreds along each short axis and the box holds millions
// of offsets per pair, nearly all outside the sphere.
#include "core/structure/periodic_distances.h"

#include <algorithm>
#include <cmath>
#include <limits>
#include <string>

#include "core/common/error.h"
#include "core/structure/lattice.h"
#include "core/structure/neighbor_list.h"
#include "core/structure/validate.h"

namespace nucleate::structure {
namespace {

// Enlarges the bound by a few ulps so rounding in r0 and |b_k| cannot drop the true minimum.
constexpr double kBoundSlack = 1e-12;
// Relative slack of the sphere intervals (see Search).
constexpr double kSphereSlack = 1e-9;
// Below this many sites all pairs are cheaper than building cell lists.
constexpr std::size_t kAllPairsSites = 64;

}  // namespace

MinimumImage::MinimumImage(const Eigen::Matrix3d& lattice)
    : lattice_(lattice), reduced_(ReduceLattice(lattice)) {
  to_reduced_ = reduced_.inverse.transpose().cast<double>();
  reciprocal_norms_ = ReciprocalLattice(reduced_.lattice).rowwise().norm();
  order_ = {0, 1, 2};
  const Eigen::Vector3d lengths = reduced_.lattice.rowwise().norm();
  std::sort(order_.data(), order_.data() + 3, [&](int a, int b) { return lengths[a] < lengths[b]; });
  Eigen::Matrix3d columns;
  for (int i = 0; i < 3; ++i) columns.col(i) = reduced_.lattice.row(order_[i]).transpose();
  triangle_ = columns.householderQr().matrixQR().triangularView<Eigen::Upper>();
  shortest_ = Search(Eigen::Vector3d::Zero(), /*exclude_zero=*/true);
}

ImageVector MinimumImage::Search(const Eigen::Vector3d& frac_delta, bool exclude_zero) const {
  if (!frac_delta.allFinite()) throw InvalidArgument("frac_coords", "is not finite");
  Eigen::Vector3d shift;
  const Eigen::Vector3d g0 = WrappedReduced(frac_delta, &shift);
  double r0;
  if (exclude_zero) {
    // Some reduced cell vector is a candidate: the shortest row bounds the answer.
    r0 = reduced_.lattice.rowwise().norm().minCoeff();
  } else {
    r0 = (reduced_.lattice.transpose() * g0).norm();
  }
  double radius2 = r0 * r0;
  // The offsets allowed along reduced axis k by the box bound and by the sphere interval
  // [centre - half, centre + half] of z_k = g0_k + n_k; empty when lo > hi.
  auto offsets = [&](int k, double centre, double half, int* lo, int* hi) {
    const double box = std::sqrt(radius2) * (1 + kBoundSlack) * reciprocal_norms_[k];
    const double lo_box = std::ceil(-g0[k] - box), hi_box = std::floor(-g0[k] + box);
    // The sphere interval gets a slack of its own: rounding in R must never drop the minimum, and
    // an offset visited in excess only costs one distance.
    const double slack = kSphereSlack * (half + std::fabs(centre) + 1.0);
    *lo = static_cast<int>(std::max(lo_box, std::ceil(centre - half - slack - g0[k])));
    *hi = static_cast<int>(std::min(hi_box, std::floor(centre + half + slack - g0[k])));
  };
  auto remaining = [&](double used) { return std::max(0.0, radius2 * (1 + kSphereSlack) - used); };
  double best2 = std::numeric_limits<double>::infinity();
  Eigen::Vector3d best_vector = Eigen::Vector3d::Zero();
  Eigen::Vector3i best_n = Eigen::Vector3i::Zero();
  const Eigen::Matrix3d& R = triangle_;
  const int k0 = order_[0], k1 = order_[1], k2 = order_[2];
  Eigen::Vector3i n;
  int lo2, hi2;
  offsets(k2, 0.0, std::sqrt(remaining(0)) / std::fabs(R(2, 2)), &lo2, &hi2);
  for (n[k2] = lo2; n[k2] <= hi2; ++n[k2]) {
    const double z2 = g0[k2] + n[k2];
    const double used2 = (R(2, 2) * z2) * (R(2, 2) * z2);
    const double centre1 = -R(1, 2) * z2 / R(1, 1);
    int lo1, hi1;
    offsets(k1, centre1, std::sqrt(remaining(used2)) / std::fabs(R(1, 1)), &lo1, &hi1);
    for (n[k1] = lo1; n[k1] <= hi1; ++n[k1]) {
      const double z1 = g0[k1] + n[k1];
      const double t1 = R(1, 1) * z1 + R(1, 2) * z2;
      const double centre0 = -(R(0, 1) * z1 + R(0, 2) * z2) / R(0, 0);
      int lo0, hi0;
      offsets(k0, centre0, std::sqrt(remaining(used2 + t1 * t1)) / std::fabs(R(0, 0)), &lo0, &hi0);
      for (n[k0] = lo0; n[k0] <= hi0; ++n[k0]) {
        if (exclude_zero && n.isZero()) continue;
        const Eigen::Vector3d v = reduced_.lattice.transpose() * (g0 + n.cast<double>());
        const double d2 = v.squaredNorm();
        // Exact ties go to the lexicographically smallest offset, so the image chosen does not
        // depend on the enumeration order.
        if (d2 < best2 || (d2 == best2 && std::lexicographical_compare(
                                              n.data(), n.data() + 3, best_n.data(), best_n.data() + 3))) {
          best2 = d2;
          best_vector = v;
          best_n = n;
          radius2 = std::min(radius2, best2);
        }
      }
    }
  }
  // Back to the caller's basis: (g + m) L' = (f + T^T m) L with m the total reduced offset.
  const Eigen::Vector3i m = best_n + shift.cast<int>();
  ImageVector out;
  out.distance = std::sqrt(best2);
  out.vector = best_vector;
  out.image = reduced_.transform.transpose() * m;
  return out;
}

ImageVector MinimumImage::Between(const Eigen::Vector3d& frac_i, const Eigen::Vector3d& frac_j) const {
  return Search(frac_j - frac_i, /*exclude_zero=*/false);
}

Eigen::Vector3d MinimumImage::WrappedReduced(const Eigen::Vector3d& frac_delta,
                                             Eigen::Vector3d* shift) const {
  const Eigen::Vector3d g = to_reduced_ * frac_delta;
  *shift = -g.array().round();
  return g + *shift;  // each component in [-0.5, 0.5]
}

double MinimumImage::LowerBound(const Eigen::Vector3d& frac_i, const Eigen::Vector3d& frac_j) const {
  Eigen::Vector3d shift;
  const Eigen::Vector3d g0 = WrappedReduced(frac_j - frac_i, &shift);
  return (g0.cwiseAbs().array() / reciprocal_norms_.array()).maxCoeff() * (1 - 1e-9);
}

Eigen::MatrixXd DistanceMatrix(const Crystal& crystal, const StructureLimits& limits) {
  ValidateCrystal(crystal, limits);
  const std::size_t n = crystal.size();
  if (static_cast<std::int64_t>(n) > kMaxDistanceMatrixSites) {
    throw LimitExceeded("atomic_numbers", std::to_string(n) + " sites: a distance matrix is limited to " +
                                              std::to_string(kMaxDistanceMatrixSites));
  }
  const MinimumImage search(crystal.lattice);
  Eigen::MatrixXd d = Eigen::MatrixXd::Zero(n, n);
  for (std::size_t i = 0; i < n; ++i) {
    for (std::size_t j = i + 1; j < n; ++j) {
      d(i, j) = d(j, i) = search.Between(crystal.frac[i], crystal.frac[j]).distance;
    }
  }
  return d;
}

ClosestPair MinimumInteratomicDistance(const Crystal& crystal, const StructureLimits& limits) {
  ValidateCrystal(crystal, limits);
  const std::size_t n = crystal.size();
  const MinimumImage search(crystal.lattice);
  // The self-image is always a candidate, so it bounds the search.
  ClosestPair best;
  best.distance = search.ShortestLatticeVector().distance;
  best.image = search.ShortestLatticeVector().image;
  auto consider = [&best](double d, std::size_t i, std::size_t j, const Eigen::Vector3i& image) {
    if (d < best.distance) best = {d, i, j, image};
  };
  if (n <= kAllPairsSites) {
    for (std::size_t i = 0; i < n; ++i) {
      for (std::size_t j = i + 1; j < n; ++j) {
        // A pair that cannot be shorter than the best so far cannot replace it (ties keep the
        // earlier pair), so its search is skipped: most pairs of a cell are.
        if (search.LowerBound(crystal.frac[i], crystal.frac[j]) >= best.distance) continue;
        const ImageVector v = search.Between(crystal.frac[i], crystal.frac[j]);
        consider(v.distance, i, j, v.image);
      }
    }
    return best;
  }
  // Cell lists with a growing cutoff: start near the mean spacing (about 4 neighbours per atom at
  // uniform density); a search that finds nothing within r proves every pair is longer than r.
  const double volume = std::fabs(crystal.lattice.determinant());
  double r = std::min(best.distance, std::cbrt(volume / static_cast<double>(n)));
  for (;;) {
    bool found = false;
    VisitNeighbors(crystal, r, [&](const Neighbor& nb) {
      if (nb.j < nb.i) return;  // each unordered pair once
      if (nb.i == nb.j) return;  // self-images: already the starting candidate
      found = true;
      consider(nb.distance, nb.i, nb.j, nb.image);
    }, limits);
    if (found || r >= best.distance) return best;
    r = std::min(2 * r, best.distance);
  }
}

}  // namespace nucleate::structure
