#include "core/match/lattice_mapping.h"

#include <cmath>

namespace nucleate::match {
namespace {

constexpr double kDegreesPerRadian = 57.29577951308232;

double AngleDegrees(const Eigen::Vector3d& x, const Eigen::Vector3d& y, double lx, double ly) {
  const double c = std::max(-1.0, std::min(1.0, x.dot(y) / (lx * ly)));
  return std::acos(c) * kDegreesPerRadian;
}

}  // namespace

double MappingSearchRadius(const Eigen::Matrix3d& target, double length_tolerance) {
  return target.rowwise().norm().maxCoeff() * (1 + length_tolerance);
}

std::vector<LatticeMapping> FindLatticeMappings(const Eigen::Matrix3d& lattice,
                                                const Eigen::Matrix3d& target,
                                                double length_tolerance, double angle_tolerance,
                                                int index,
                                                const std::vector<LatticePoint>* points) {
  std::vector<LatticePoint> own;
  if (!points) {
    own = LatticePointsWithin(lattice, MappingSearchRadius(target, length_tolerance));
    points = &own;
  }
  const double hi = 1 + length_tolerance, lo = 1 / hi;
  Eigen::Vector3d t_len = target.rowwise().norm();
  const Eigen::Vector3d t0 = target.row(0), t1 = target.row(1), t2 = target.row(2);
  const double t_alpha = AngleDegrees(t1, t2, t_len[1], t_len[2]);
  const double t_beta = AngleDegrees(t0, t2, t_len[0], t_len[2]);
  const double t_gamma = AngleDegrees(t0, t1, t_len[0], t_len[1]);

  std::vector<const LatticePoint*> cand[3];
  for (const auto& p : *points) {
    for (int k = 0; k < 3; ++k) {
      const double ratio = p.length / t_len[k];
      if (ratio > lo && ratio < hi) cand[k].push_back(&p);
    }
  }
  std::vector<LatticeMapping> out;
  for (const LatticePoint* a : cand[0]) {
    for (const LatticePoint* b : cand[1]) {
      if (std::abs(AngleDegrees(a->cartesian, b->cartesian, a->length, b->length) - t_gamma) >=
          angle_tolerance) {
        continue;
      }
      for (const LatticePoint* c : cand[2]) {
        if (std::abs(AngleDegrees(b->cartesian, c->cartesian, b->length, c->length) - t_alpha) >=
                angle_tolerance ||
            std::abs(AngleDegrees(a->cartesian, c->cartesian, a->length, c->length) - t_beta) >=
                angle_tolerance) {
          continue;
        }
        LatticeMapping m;
        m.coefficients.row(0) = a->coefficients.transpose();
        m.coefficients.row(1) = b->coefficients.transpose();
        m.coefficients.row(2) = c->coefficients.transpose();
        const int det = m.coefficients.determinant();  // exact integer arithmetic
        if (det != index && det != -index) continue;
        m.basis.row(0) = a->cartesian.transpose();
        m.basis.row(1) = b->cartesian.transpose();
        m.basis.row(2) = c->cartesian.transpose();
        out.push_back(m);
      }
    }
  }
  return out;
}

}  // namespace nucleate::match
