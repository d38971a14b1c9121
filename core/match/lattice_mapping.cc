#include "core/match/lattice_mapping.h"

#include <cmath>
#include <limits>
#include <string>

#include "core/common/error.h"

namespace nucleate::match {
namespace {

constexpr double kDegreesPerRadian = 57.29577951308232;

double Cosine(const Eigen::Vector3d& x, const Eigen::Vector3d& y, double lx, double ly) {
  return x.dot(y) / (lx * ly);
}

double DegreesFromCosine(double c) {
  return std::acos(std::max(-1.0, std::min(1.0, c))) * kDegreesPerRadian;
}

}  // namespace

double AngleDegrees(const Eigen::Vector3d& x, const Eigen::Vector3d& y, double lx, double ly) {
  return DegreesFromCosine(Cosine(x, y, lx, ly));
}

void CosineWindow(double from_degrees, double to_degrees, double* lo, double* hi) {
  const double inf = std::numeric_limits<double>::infinity();
  *lo = to_degrees >= 180 ? -inf
                          : std::cos(to_degrees / kDegreesPerRadian) - kCosineSlack;
  *hi = from_degrees <= 0 ? inf
                          : std::cos(from_degrees / kDegreesPerRadian) + kCosineSlack;
}

MappingTest::MappingTest(const Eigen::Matrix3d& target, double length_tolerance,
                         double angle_tolerance)
    : hi_(1 + length_tolerance), angle_tolerance_(angle_tolerance) {
  lo_ = 1 / hi_;
  const Eigen::Vector3d length = target.rowwise().norm();
  for (int k = 0; k < 3; ++k) length_[k] = length[k];
  const Eigen::Vector3d t0 = target.row(0), t1 = target.row(1), t2 = target.row(2);
  angle_[0] = AngleDegrees(t1, t2, length_[1], length_[2]);
  angle_[1] = AngleDegrees(t0, t2, length_[0], length_[2]);
  angle_[2] = AngleDegrees(t0, t1, length_[0], length_[1]);
}

bool MappingTest::Accepts(const CandidateBasis& v) const {
  for (int k = 0; k < 3; ++k) {
    if (!LengthFits(k, v.length[k]) || !AngleFits(k, v.angle[k])) return false;
  }
  return true;
}

void CheckMappingSearchSize(std::size_t n0, std::size_t n1, std::size_t n2) {
  // A sane pair of cells leaves tens of candidates per row (about 10^5 triples at most, even for
  // supercell searches); a cell with a vector far shorter than the others (0.01 A beside 100 A)
  // leaves tens of thousands, and the triples, the pair tables and the mappings kept run into the
  // billions.
  const double a = static_cast<double>(n0), b = static_cast<double>(n1), c = static_cast<double>(n2);
  if (a * b * c > kMaxMappingTriples || a * b > kMaxMappingPairs || a * c > kMaxMappingPairs ||
      b * c > kMaxMappingPairs) {
    throw LimitExceeded("lattice", "the cells are too anisotropic to compare: " +
                                       std::to_string(n0) + " x " + std::to_string(n1) + " x " +
                                       std::to_string(n2) +
                                       " candidate cell vectors, above the limits of 1e8 "
                                       "triples and 1e7 pairs (is a cell vector nearly zero?)");
  }
}

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
  const MappingTest test(target, length_tolerance, angle_tolerance);

  std::vector<const LatticePoint*> cand[3];
  for (const auto& p : *points) {
    for (int k = 0; k < 3; ++k) {
      if (test.LengthFits(k, p.length)) cand[k].push_back(&p);
    }
  }
  // Each angle is first screened by its cosine (the window never rejects an angle that
  // AngleFits accepts), so the acos is only taken for the few pairs near the window.
  double cos_lo[3], cos_hi[3];
  for (int k = 0; k < 3; ++k) {
    CosineWindow(test.angle(k) - angle_tolerance, test.angle(k) + angle_tolerance, &cos_lo[k],
                 &cos_hi[k]);
  }
  const auto fits = [&](int k, const LatticePoint* x, const LatticePoint* y) {
    const double c = Cosine(x->cartesian, y->cartesian, x->length, y->length);
    return c > cos_lo[k] && c < cos_hi[k] && test.AngleFits(k, DegreesFromCosine(c));
  };
  CheckMappingSearchSize(cand[0].size(), cand[1].size(), cand[2].size());
  std::vector<LatticeMapping> out;
  for (const LatticePoint* a : cand[0]) {
    for (const LatticePoint* b : cand[1]) {
      if (!fits(2, a, b)) continue;
      for (const LatticePoint* c : cand[2]) {
        if (!fits(0, b, c) || !fits(1, a, c)) continue;
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
