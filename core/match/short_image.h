// Minimum-image vectors for SHORT separations in a nearly reduced cell: the fractional difference
// is wrapped to [-1/2, 1/2) and the 27 neighbouring images are tried. In a reduced cell this finds
// the true minimum for any vector shorter than about the smallest interplanar spacing, which is
// all the matcher needs (displacements a fraction of the site spacing, nearest-neighbour
// distances); longer vectors come out possibly too long, which only makes them costlier in an
// assignment that rejects them anyway. core/structure/periodic_distances.h is the exact search.
#pragma once

#include <array>
#include <cmath>
#include <limits>

#include <Eigen/Dense>

namespace nucleate::match {

class ShortImage {
 public:
  explicit ShortImage(const Eigen::Matrix3d& lattice) : lattice_(lattice) {
    int k = 0;
    for (int i = -1; i <= 1; ++i)
      for (int j = -1; j <= 1; ++j)
        for (int l = -1; l <= 1; ++l) offsets_[k++] = lattice.transpose() * Eigen::Vector3d(i, j, l);
  }

  // Shortest Cartesian vector among the images of frac_delta (fractional, any range).
  Eigen::Vector3d Vector(const Eigen::Vector3d& frac_delta) const {
    const Eigen::Vector3d wrapped = frac_delta - frac_delta.array().round().matrix();
    const Eigen::Vector3d base = lattice_.transpose() * wrapped;
    Eigen::Vector3d best = base;
    double best2 = std::numeric_limits<double>::infinity();
    for (const auto& o : offsets_) {
      const Eigen::Vector3d v = base + o;
      const double d2 = v.squaredNorm();
      if (d2 < best2) {
        best2 = d2;
        best = v;
      }
    }
    return best;
  }

  // Whether some image of frac_delta (the same 27 as Vector tries) is shorter than sqrt(limit2):
  // the same verdict as Vector(frac_delta).squaredNorm() < limit2, stopping at the first such
  // image. The wrapped vector itself (one of the 27) is the usual winner, so it goes first.
  bool Within(const Eigen::Vector3d& frac_delta, double limit2) const {
    const Eigen::Vector3d wrapped = frac_delta - frac_delta.array().round().matrix();
    const Eigen::Vector3d base = lattice_.transpose() * wrapped;
    if (base.squaredNorm() < limit2) return true;
    for (const auto& o : offsets_) {
      if ((base + o).squaredNorm() < limit2) return true;
    }
    return false;
  }

  // Shortest image distance of frac_delta, leaving out the zero vector itself: with
  // frac_delta = 0 this is the distance from an atom to its own nearest image.
  double DistanceExcludingZero(const Eigen::Vector3d& frac_delta) const {
    const Eigen::Vector3d wrapped = frac_delta - frac_delta.array().round().matrix();
    const Eigen::Vector3d base = lattice_.transpose() * wrapped;
    double best2 = std::numeric_limits<double>::infinity();
    for (const auto& o : offsets_) {
      const double d2 = (base + o).squaredNorm();
      if (d2 > 1e-20 && d2 < best2) best2 = d2;
    }
    return std::sqrt(best2);
  }

 private:
  Eigen::Matrix3d lattice_;
  std::array<Eigen::Vector3d, 27> offsets_;
};

}  // namespace nucleate::match
