#include "core/structure/lattice_reduction.h"

#include <cmath>
#include <utility>

#include "core/common/error.h"
#include "core/structure/lattice.h"

namespace nucleate::structure {
namespace {

constexpr double kLovasz = 0.99;
// LLL needs O(log(condition)) swaps; a cell within StructureLimits needs a few dozen.
constexpr int kMaxIterations = 10000;
// Integer multipliers beyond this mean the input was numerically singular.
constexpr double kMaxMultiplier = 1e9;

struct GramSchmidt {
  Eigen::Matrix3d mu = Eigen::Matrix3d::Zero();
  Eigen::Vector3d norm2 = Eigen::Vector3d::Zero();  // |b*_k|^2
};

GramSchmidt Orthogonalise(const Eigen::Matrix3d& b) {
  GramSchmidt gs;
  Eigen::Matrix3d star;
  for (int k = 0; k < 3; ++k) {
    Eigen::RowVector3d v = b.row(k);
    for (int j = 0; j < k; ++j) {
      gs.mu(k, j) = b.row(k).dot(star.row(j)) / gs.norm2[j];
      v -= gs.mu(k, j) * star.row(j);
    }
    star.row(k) = v;
    gs.norm2[k] = v.squaredNorm();
  }
  return gs;
}

}  // namespace

ReducedLattice ReduceLattice(const Eigen::Matrix3d& lattice) {
  // ReciprocalLattice checks finiteness and singularity with the field names we want.
  (void)ReciprocalLattice(lattice);
  Eigen::Matrix3d b = lattice;
  Eigen::Matrix3i m = Eigen::Matrix3i::Identity();
  int k = 1;
  for (int iteration = 0; k < 3; ++iteration) {
    if (iteration > kMaxIterations) throw Numerical("lattice", "lattice reduction did not converge");
    // Size reduction of row k against rows k-1..0.
    for (int j = k - 1; j >= 0; --j) {
      const GramSchmidt gs = Orthogonalise(b);
      const double q = std::round(gs.mu(k, j));
      if (q == 0) continue;
      if (!(std::fabs(q) < kMaxMultiplier)) {
        throw Numerical("lattice", "lattice is numerically singular: reduction diverged");
      }
      b.row(k) -= q * b.row(j);
      m.row(k) -= static_cast<int>(q) * m.row(j);
    }
    const GramSchmidt gs = Orthogonalise(b);
    if (gs.norm2[k] >= (kLovasz - gs.mu(k, k - 1) * gs.mu(k, k - 1)) * gs.norm2[k - 1]) {
      ++k;
    } else {
      b.row(k).swap(b.row(k - 1));
      m.row(k).swap(m.row(k - 1));
      k = std::max(k - 1, 1);
    }
  }
  ReducedLattice r;
  // Recomputed from the integer transform so that lattice == transform * original to rounding.
  r.lattice = m.cast<double>() * lattice;
  r.transform = m;
  // The inverse of a unimodular integer matrix is integer: round away the floating-point noise.
  const Eigen::Matrix3d inv = m.cast<double>().inverse();
  r.inverse = inv.array().round().cast<int>().matrix();
  return r;
}

}  // namespace nucleate::structure
