#include "core/match/lattice_points.h"

#include <algorithm>
#include <cmath>

#include "core/common/error.h"
#include "core/structure/lattice.h"
#include "core/structure/lattice_reduction.h"

namespace nucleate::match {
namespace {

// Relative slack on the radius so a vector exactly at the radius survives rounding.
constexpr double kRadiusSlack = 1e-9;

bool Before(const LatticePoint& x, const LatticePoint& y) {
  // Lengths equal to rounding are ties: order them by coefficients for a platform-stable order.
  if (std::abs(x.length - y.length) > 1e-9 * std::max(x.length, y.length)) {
    return x.length < y.length;
  }
  for (int k = 0; k < 3; ++k) {
    if (x.coefficients[k] != y.coefficients[k]) return x.coefficients[k] > y.coefficients[k];
  }
  return false;
}

}  // namespace

std::vector<LatticePoint> LatticePointsWithin(const Eigen::Matrix3d& lattice, double radius) {
  std::vector<LatticePoint> points;
  LatticePointsWithin(lattice, radius, &points);
  return points;
}

void LatticePointsWithin(const Eigen::Matrix3d& lattice, double radius,
                         std::vector<LatticePoint>* out) {
  const double r = radius * (1 + kRadiusSlack);
  const Eigen::Vector3d recip = structure::ReciprocalLattice(lattice).rowwise().norm();
  // The count is judged in double before any bound becomes an int: a bound beyond int's range
  // would make the conversion undefined.
  double extent[3];
  double count = 1;
  for (int k = 0; k < 3; ++k) {
    extent[k] = std::floor(r * recip[k]);
    count *= 2.0 * extent[k] + 1;
  }
  if (!(count <= static_cast<double>(kMaxLatticePoints))) {
    throw LimitExceeded("lattice", "lattice-vector search would visit more than " +
                                       std::to_string(kMaxLatticePoints) + " points");
  }
  int bound[3];
  for (int k = 0; k < 3; ++k) bound[k] = static_cast<int>(extent[k]);
  std::vector<LatticePoint>& points = *out;
  points.clear();
  for (int i = -bound[0]; i <= bound[0]; ++i) {
    for (int j = -bound[1]; j <= bound[1]; ++j) {
      for (int k = -bound[2]; k <= bound[2]; ++k) {
        if (i == 0 && j == 0 && k == 0) continue;
        const Eigen::Vector3d v = lattice.transpose() * Eigen::Vector3d(i, j, k);
        const double len = v.norm();
        if (len <= r) points.push_back({Eigen::Vector3i(i, j, k), v, len});
      }
    }
  }
  std::sort(points.begin(), points.end(), Before);
}

Eigen::Matrix3d ShortestBasis(const Eigen::Matrix3d& lattice, Eigen::Matrix3i* transform) {
  const structure::ReducedLattice lll = structure::ReduceLattice(lattice);
  // The longest LLL row is at least the third successive minimum: every candidate is inside.
  const auto points = LatticePointsWithin(lll.lattice, lll.lattice.rowwise().norm().maxCoeff());
  const std::size_t m = points.size();
  for (std::size_t i = 0; i < m; ++i) {
    for (std::size_t j = i + 1; j < m; ++j) {
      const Eigen::Vector3d cross = points[i].cartesian.cross(points[j].cartesian);
      if (cross.norm() <= 1e-9 * points[i].length * points[j].length) continue;
      for (std::size_t k = j + 1; k < m; ++k) {
        Eigen::Matrix3i n;
        n.row(0) = points[i].coefficients.transpose();
        n.row(1) = points[j].coefficients.transpose();
        n.row(2) = points[k].coefficients.transpose();
        // Integer determinant +-1: a basis of the same lattice (exact, no rounding).
        const int det = n.determinant();
        if (det != 1 && det != -1) continue;
        Eigen::Matrix3i total = n * lll.transform;
        Eigen::Matrix3d basis = total.cast<double>() * lattice;
        if (basis.determinant() < 0) {  // right-handed, whatever the input's handedness
          total.row(2) *= -1;
          basis.row(2) *= -1;
        }
        if (transform) *transform = total;
        return basis;
      }
    }
  }
  // Unreachable for a non-singular lattice (the LLL rows themselves are candidates); keep the
  // LLL basis rather than fail.
  if (transform) *transform = lll.transform;
  return lll.lattice;
}

}  // namespace nucleate::match
