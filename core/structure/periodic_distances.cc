// The image bound. Write a periodic vector as x = g * L (row g of reduced fractional coordinates,
// L the reduced lattice) and let B be the reciprocal lattice (rows b_k, a_i . b_k = delta_ik).
// Then g_k = x . b_k, so |g_k| <= |x| |b_k|. If some candidate image has length r0, every image at
// least as short has |g_k| <= r0 |b_k| along each axis k: enumerating those integer offsets finds
// the true minimum for any lattice. Reducing the lattice first only keeps r0 |b_k| small.
#include "core/structure/periodic_distances.h"

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
// Below this many sites all pairs are cheaper than building cell lists.
constexpr std::size_t kAllPairsSites = 64;

}  // namespace

MinimumImage::MinimumImage(const Eigen::Matrix3d& lattice)
    : lattice_(lattice), reduced_(ReduceLattice(lattice)) {
  to_reduced_ = reduced_.inverse.transpose().cast<double>();
  reciprocal_norms_ = ReciprocalLattice(reduced_.lattice).rowwise().norm();
  shortest_ = Search(Eigen::Vector3d::Zero(), /*exclude_zero=*/true);
}

ImageVector MinimumImage::Search(const Eigen::Vector3d& frac_delta, bool exclude_zero) const {
  if (!frac_delta.allFinite()) throw InvalidArgument("frac_coords", "is not finite");
  const Eigen::Vector3d g = to_reduced_ * frac_delta;
  const Eigen::Vector3d shift = -g.array().round();
  const Eigen::Vector3d g0 = g + shift;  // each component in [-0.5, 0.5]
  double r0;
  if (exclude_zero) {
    // Some reduced cell vector is a candidate: the shortest row bounds the answer.
    r0 = reduced_.lattice.rowwise().norm().minCoeff();
  } else {
    r0 = (reduced_.lattice.transpose() * g0).norm();
  }
  const double r = r0 * (1 + kBoundSlack);
  int lo[3], hi[3];
  for (int k = 0; k < 3; ++k) {
    lo[k] = static_cast<int>(std::ceil(-g0[k] - r * reciprocal_norms_[k]));
    hi[k] = static_cast<int>(std::floor(-g0[k] + r * reciprocal_norms_[k]));
  }
  double best2 = std::numeric_limits<double>::infinity();
  Eigen::Vector3d best_vector = Eigen::Vector3d::Zero();
  Eigen::Vector3i best_n = Eigen::Vector3i::Zero();
  for (int n0 = lo[0]; n0 <= hi[0]; ++n0) {
    for (int n1 = lo[1]; n1 <= hi[1]; ++n1) {
      for (int n2 = lo[2]; n2 <= hi[2]; ++n2) {
        if (exclude_zero && n0 == 0 && n1 == 0 && n2 == 0) continue;
        const Eigen::Vector3d v =
            reduced_.lattice.transpose() * (g0 + Eigen::Vector3d(n0, n1, n2));
        const double d2 = v.squaredNorm();
        if (d2 < best2) {
          best2 = d2;
          best_vector = v;
          best_n = {n0, n1, n2};
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
