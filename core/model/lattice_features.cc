#include "core/model/lattice_features.h"

#include <cmath>
#include <string>

#include "core/common/error.h"
#include "core/structure/validate.h"

namespace nucleate::model {
namespace {

const double kSqrt2 = std::sqrt(2.0);

double AtomCountShift(int atom_count) {
  if (atom_count < 1) {
    throw InvalidArgument("atom_count", "must be at least 1, got " + std::to_string(atom_count));
  }
  return 2.0 / 3.0 * std::log(static_cast<double>(atom_count));
}

// f(M) = V f(Lambda) V^T for a symmetric M. The iterative solver (not computeDirect's closed
// form) keeps the small eigenvalues of a skewed cell's metric accurate to rounding.
template <typename Function>
Eigen::Matrix3d SymmetricFunction(const Eigen::Matrix3d& m, Function f, const char* field) {
  Eigen::SelfAdjointEigenSolver<Eigen::Matrix3d> solver(m);
  if (solver.info() != Eigen::Success) {
    throw Numerical(field, "eigen-decomposition did not converge");
  }
  Eigen::Vector3d values = solver.eigenvalues();
  for (int k = 0; k < 3; ++k) values[k] = f(values[k]);
  const Eigen::Matrix3d& v = solver.eigenvectors();
  const Eigen::Matrix3d out = v * values.asDiagonal() * v.transpose();
  return 0.5 * (out + out.transpose());
}

}  // namespace

LatticeFeatures LatticeToFeatures(const Eigen::Matrix3d& lattice, int atom_count) {
  for (int k = 0; k < 9; ++k) {
    if (!std::isfinite(lattice(k / 3, k % 3))) {
      throw InvalidArgument("lattice[" + std::to_string(k) + "]", "must be a finite number");
    }
  }
  const double shift = AtomCountShift(atom_count);
  // The same degeneracy test as ValidateCrystal: a flattened cell's smallest metric eigenvalue
  // is rounding noise, whose logarithm would be a meaningless large negative number.
  const double lengths = lattice.row(0).norm() * lattice.row(1).norm() * lattice.row(2).norm();
  if (!(std::abs(lattice.determinant()) > structure::kMinRelativeVolume * lengths)) {
    throw InvalidArgument("lattice", "degenerate cell (volume " +
                                         std::to_string(std::abs(lattice.determinant())) +
                                         " A^3): the metric tensor has no logarithm");
  }
  const Eigen::Matrix3d metric = lattice * lattice.transpose();
  bool singular = false;
  const Eigen::Matrix3d s = SymmetricFunction(
      metric,
      [&singular](double lambda) {
        if (!(lambda > 0.0)) {
          singular = true;
          return 0.0;
        }
        return std::log(lambda);
      },
      "lattice");
  if (singular) {
    throw InvalidArgument("lattice", "singular cell: the metric tensor has no logarithm");
  }
  LatticeFeatures f;
  f << s(0, 0) - shift, s(1, 1) - shift, s(2, 2) - shift, kSqrt2 * s(1, 2), kSqrt2 * s(0, 2),
      kSqrt2 * s(0, 1);
  return f;
}

Eigen::Matrix3d FeaturesToLattice(const LatticeFeatures& features, int atom_count) {
  for (int k = 0; k < 6; ++k) {
    if (!std::isfinite(features[k])) {
      throw InvalidArgument("features[" + std::to_string(k) + "]", "must be a finite number");
    }
  }
  const double shift = AtomCountShift(atom_count);
  Eigen::Matrix3d s;
  s(0, 0) = features[0] + shift;
  s(1, 1) = features[1] + shift;
  s(2, 2) = features[2] + shift;
  s(1, 2) = s(2, 1) = features[3] / kSqrt2;
  s(0, 2) = s(2, 0) = features[4] / kSqrt2;
  s(0, 1) = s(1, 0) = features[5] / kSqrt2;
  const Eigen::Matrix3d metric =
      SymmetricFunction(s, [](double mu) { return std::exp(mu); }, "features");
  if (!metric.allFinite()) throw Numerical("features", "the metric tensor overflows");

  // G = L L^T with L lower triangular: rows a = (L00, 0, 0), b = (L10, L11, 0), c = (L20, L21,
  // L22) are the standard orientation, and Eigen's LLT gives a positive diagonal.
  const Eigen::LLT<Eigen::Matrix3d> cholesky(metric);
  if (cholesky.info() != Eigen::Success) {
    throw Numerical("features", "the metric tensor is not positive definite in double precision");
  }
  const Eigen::Matrix3d lattice = cholesky.matrixL();
  const double volume = lattice(0, 0) * lattice(1, 1) * lattice(2, 2);
  const double lengths =
      lattice.row(0).norm() * lattice.row(1).norm() * lattice.row(2).norm();
  if (!std::isfinite(volume) || !std::isfinite(lengths) ||
      !(volume > structure::kMinRelativeVolume * lengths)) {
    throw Numerical("features", "the cell is degenerate (volume " + std::to_string(volume) +
                                    " A^3 for axis lengths whose product is " +
                                    std::to_string(lengths) + ")");
  }
  return lattice;
}

LatticeFeatures LatticeStatistics::Standardise(const LatticeFeatures& features) const {
  for (int k = 0; k < 6; ++k) {
    if (!std::isfinite(mean[k])) {
      throw InvalidArgument("mean[" + std::to_string(k) + "]", "must be a finite number");
    }
    if (!std::isfinite(std[k]) || !(std[k] > 0.0)) {
      throw InvalidArgument("std[" + std::to_string(k) + "]", "must be a finite number > 0");
    }
  }
  return (features - mean).cwiseQuotient(std);
}

LatticeFeatures LatticeStatistics::Unstandardise(const LatticeFeatures& standardised) const {
  // The same checks: a zero std here would silently collapse every sampled cell onto the mean.
  Standardise(LatticeFeatures::Zero());
  return standardised.cwiseProduct(std) + mean;
}

LatticeStatistics ComputeLatticeStatistics(const std::vector<SizedLattice>& cells) {
  if (cells.empty()) throw InvalidArgument("cells", "needs at least one cell");
  std::vector<LatticeFeatures> features;
  features.reserve(cells.size());
  for (std::size_t i = 0; i < cells.size(); ++i) {
    try {
      features.push_back(LatticeToFeatures(cells[i].lattice, cells[i].atom_count));
    } catch (const Error& error) {
      throw error.WithinField("cells[" + std::to_string(i) + "]");
    }
  }
  // Two passes (mean, then squared deviations): no cancellation when the spread is tiny
  // compared with the mean, as for the diagonal entries of similar cells.
  const double n = static_cast<double>(features.size());
  LatticeStatistics stats;
  stats.mean.setZero();
  for (const LatticeFeatures& f : features) stats.mean += f;
  stats.mean /= n;
  LatticeFeatures squares = LatticeFeatures::Zero();
  for (const LatticeFeatures& f : features) squares += (f - stats.mean).cwiseAbs2();
  stats.std = (squares / n).cwiseSqrt().cwiseMax(kMinLatticeFeatureStd);
  return stats;
}

}  // namespace nucleate::model
