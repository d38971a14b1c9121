// Minimum-image vectors for SHORT separations in a nearly reduced cell: the fractional difference
// is wrapped to [-1/2, 1/2) and the 27 neighbouring images are tried. In a reduced cell this finds
// the true minimum for any vector shorter than about the smallest interplanar spacing, which is
// all the matcher needs (displacements a fraction of the site spacing, nearest-neighbour
// distances); longer vectors come out possibly too long, which only makes them costlier in an
// assignment that rejects them anyway. core/structure/periodic_distances.h is the exact search.
#pragma once

#include <algorithm>
#include <array>
#include <cmath>
#include <limits>

#include <Eigen/Dense>

namespace nucleate::match {

// x - std::round(x) (the nearest integer, halves away from zero, subtracted), bit for bit and
// sign of zero included, without the library call the baseline x86-64 target cannot inline and
// without branches on the data (the matcher wraps random fractions, whose outcome no branch
// predictor can guess). Below 2^52 in magnitude the integer part t is exact, and so is d = x - t
// in (-1, 1); x - round(x) is then d, d - 1 or d + 1 as |d| reaches 1/2, each exact, so equal
// to the library's exact difference. Adding +0 turns the -0 of x = -0 into the +0 that x - x
// gives.
inline double WrappedFraction(double x) {
  if (!(std::abs(x) < 0x1p52)) return x - std::round(x);  // large, infinite or NaN: the library
  const double d = x - static_cast<double>(static_cast<long long>(x));
  const int step = static_cast<int>(d >= 0.5) - static_cast<int>(d <= -0.5);
  return (d - step) + 0.0;
}

class ShortImage {
 public:
  explicit ShortImage(const Eigen::Matrix3d& lattice) : lattice_(lattice) {
    // Squared plane spacings 1 / |r_k|^2 (r_k the reciprocal rows), for the image bounds below.
    const Eigen::Matrix3d reciprocal = lattice.inverse().transpose();
    for (int a = 0; a < 3; ++a) spacing2_[a] = 1 / reciprocal.row(a).squaredNorm();
    longest2_ = lattice.rowwise().squaredNorm().maxCoeff();
  }

  // Shortest Cartesian vector among the images of frac_delta (fractional, any range): the first
  // strictly shortest of the 27 in the order of (i, j, l) from (-1, -1, -1) to (1, 1, 1). Images
  // that cannot be as short as the wrapped vector itself are skipped (Allowed), which cannot change
  // which image that is.
  Eigen::Vector3d Vector(const Eigen::Vector3d& frac_delta) const {
    const Eigen::Vector3d wrapped = Wrap(frac_delta);
    const Eigen::Vector3d base = lattice_.transpose() * wrapped;
    int allowed[3];
    Allowed(wrapped, Bound2(base.squaredNorm()), allowed);
    Eigen::Vector3d best = base;
    double best2 = std::numeric_limits<double>::infinity();
    ForEachAllowedImage(base, allowed, [&](const Eigen::Vector3d& v) {
      const double d2 = v.squaredNorm();
      if (d2 < best2) {
        best2 = d2;
        best = v;
      }
      return false;
    });
    return best;
  }

  // Whether some image of frac_delta (of the same 27 as Vector tries) is shorter than
  // sqrt(limit2): the same verdict as Vector(frac_delta).squaredNorm() < limit2. Most calls
  // reject, and usually the bounds alone show it.
  bool Within(const Eigen::Vector3d& frac_delta, double limit2) const {
    const Eigen::Vector3d wrapped = Wrap(frac_delta);
    // As |wrapped_k| <= 1/2 <= |wrapped_k +- 1|, an axis whose bound rules out n_k = 0 rules out
    // all three images along it: this settles most calls on three products (and one branch on
    // their maximum, as the outcomes are random).
    const double bound2 = Bound2(limit2);
    const double axis_bound2 = std::max(std::max(wrapped[0] * wrapped[0] * spacing2_[0],
                                                 wrapped[1] * wrapped[1] * spacing2_[1]),
                                        wrapped[2] * wrapped[2] * spacing2_[2]);
    if (axis_bound2 > bound2) return false;
    const Eigen::Vector3d base = lattice_.transpose() * wrapped;
    if (base.squaredNorm() < limit2) return true;  // the usual winner first
    int allowed[3];
    Allowed(wrapped, bound2, allowed);
    return ForEachAllowedImage(
        base, allowed, [&](const Eigen::Vector3d& v) { return v.squaredNorm() < limit2; });
  }

  // Shortest image distance of frac_delta, leaving out the zero vector itself: with
  // frac_delta = 0 this is the distance from an atom to its own nearest image.
  double DistanceExcludingZero(const Eigen::Vector3d& frac_delta) const {
    const Eigen::Vector3d base = lattice_.transpose() * Wrap(frac_delta);
    double best2 = std::numeric_limits<double>::infinity();
    for (int i = -1; i <= 1; ++i)
      for (int j = -1; j <= 1; ++j)
        for (int l = -1; l <= 1; ++l) {
          const double d2 = (base + Offset(i, j, l)).squaredNorm();
          if (d2 > 1e-20 && d2 < best2) best2 = d2;
        }
    return std::sqrt(best2);
  }

  // Calls visit(base + image offset) for the allowed images in (i, j, l) order from (-1, -1, -1),
  // stopping at the first call that returns true; returns whether one did.
  template <typename Visit>
  bool ForEachAllowedImage(const Eigen::Vector3d& base, const int allowed[3], Visit&& visit) const {
    for (int i = -1; i <= 1; ++i) {
      if (!(allowed[0] >> (i + 1) & 1)) continue;
      for (int j = -1; j <= 1; ++j) {
        if (!(allowed[1] >> (j + 1) & 1)) continue;
        for (int l = -1; l <= 1; ++l) {
          if (!(allowed[2] >> (l + 1) & 1)) continue;
          if (visit(base + Offset(i, j, l))) return true;
        }
      }
    }
    return false;
  }

 private:
  static Eigen::Vector3d Wrap(const Eigen::Vector3d& frac_delta) {
    return {WrappedFraction(frac_delta[0]), WrappedFraction(frac_delta[1]),
            WrappedFraction(frac_delta[2])};
  }

  // The Cartesian offset of image (i, j, l), always by this one expression, so every method
  // sees the same vector for the same image.
  Eigen::Vector3d Offset(int i, int j, int l) const {
    return lattice_.transpose() * Eigen::Vector3d(i, j, l);
  }

  // The bound that rules images out without computing them: the image wrapped + n has k-th
  // fractional component wrapped_k + n_k, and a vector with k-th component g_k is at least |g_k|
  // times the spacing of the k-th lattice planes long. An image whose bound for some axis
  // exceeds Bound2(limit2) is longer than sqrt(limit2) in the caller's arithmetic too: the margin
  // (relative 1e-6, plus 1e-10 of the longest cell vector squared against cancellation) is far
  // above the rounding of the squared lengths compared.
  double Bound2(double limit2) const { return limit2 * (1 + 1e-6) + 1e-10 * longest2_; }

  // Per axis, bit n_k + 1 of allowed[k] is set unless the bound rules out n_k. Bit 1 (n_k = 0)
  // is always set: an extra candidate only costs time.
  void Allowed(const Eigen::Vector3d& wrapped, double bound2, int allowed[3]) const {
    for (int a = 0; a < 3; ++a) {
      const double lo = wrapped[a] - 1, hi = wrapped[a] + 1;
      allowed[a] = (lo * lo * spacing2_[a] <= bound2) | 2 | (hi * hi * spacing2_[a] <= bound2) << 2;
    }
  }

  Eigen::Matrix3d lattice_;
  double spacing2_[3];
  double longest2_;
};

}  // namespace nucleate::match
