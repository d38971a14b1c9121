#include "core/structure/lattice.h"

#include <cmath>
#include <string>

#include "core/common/error.h"

namespace nucleate::structure {
namespace {

constexpr double kPi = 3.14159265358979323846;
double Radians(double degrees) { return degrees * kPi / 180.0; }
double Degrees(double radians) { return radians * 180.0 / kPi; }

// Angle between two vectors by atan2 of |u x v| and u . v: accurate near 0 and 180 degrees, where
// acos of the cosine loses half the digits.
double AngleDegrees(const Eigen::Vector3d& u, const Eigen::Vector3d& v) {
  return Degrees(std::atan2(u.cross(v).norm(), u.dot(v)));
}

// cos of an angle given in degrees, exact zero at 90 so orthogonal cells stay exactly orthogonal.
double CosDegrees(double degrees) { return degrees == 90.0 ? 0.0 : std::cos(Radians(degrees)); }
double SinDegrees(double degrees) { return degrees == 90.0 ? 1.0 : std::sin(Radians(degrees)); }

void RequireFinite(const Eigen::Matrix3d& lattice) {
  for (int r = 0; r < 3; ++r) {
    for (int c = 0; c < 3; ++c) {
      if (!std::isfinite(lattice(r, c))) {
        // Row-major index, as the 9 doubles of a lattice are laid out in messages.
        throw InvalidArgument("lattice[" + std::to_string(3 * r + c) + "]", "is not finite");
      }
    }
  }
}

}  // namespace

LatticeParameters ParametersFromMatrix(const Eigen::Matrix3d& lattice) {
  RequireFinite(lattice);
  const Eigen::Vector3d a = lattice.row(0), b = lattice.row(1), c = lattice.row(2);
  static const char* const kNames[3] = {"a", "b", "c"};
  for (int i = 0; i < 3; ++i) {
    if (lattice.row(i).norm() == 0.0) {
      throw InvalidArgument("lattice", std::string("cell vector ") + kNames[i] + " has zero length");
    }
  }
  LatticeParameters p;
  p.a = a.norm();
  p.b = b.norm();
  p.c = c.norm();
  p.alpha = AngleDegrees(b, c);
  p.beta = AngleDegrees(a, c);
  p.gamma = AngleDegrees(a, b);
  return p;
}

Eigen::Matrix3d MatrixFromParameters(const LatticeParameters& p) {
  const double lengths[3] = {p.a, p.b, p.c};
  const double angles[3] = {p.alpha, p.beta, p.gamma};
  static const char* const kLengthNames[3] = {"a", "b", "c"};
  static const char* const kAngleNames[3] = {"alpha", "beta", "gamma"};
  for (int i = 0; i < 3; ++i) {
    if (!std::isfinite(lengths[i]) || lengths[i] <= 0) {
      throw InvalidArgument(kLengthNames[i], "must be a positive finite length in angstrom");
    }
    if (!std::isfinite(angles[i]) || angles[i] <= 0 || angles[i] >= 180) {
      throw InvalidArgument(kAngleNames[i], "must lie strictly between 0 and 180 degrees");
    }
  }
  const double ca = CosDegrees(p.alpha), cb = CosDegrees(p.beta), cg = CosDegrees(p.gamma);
  const double sg = SinDegrees(p.gamma);
  // c = (cx, cy, cz) from c.a = c a cos(beta) and c.b = c b cos(alpha) with b = b (cos g, sin g, 0).
  const double cx = cb;
  const double cy = (ca - cb * cg) / sg;
  const double cz2 = 1.0 - cx * cx - cy * cy;
  if (!(cz2 > 0)) {
    throw InvalidArgument("gamma", "alpha, beta and gamma do not close a cell (each angle must be "
                                   "less than the sum of the other two, and their sum below 360)");
  }
  Eigen::Matrix3d m;
  m << p.a, 0, 0,
       p.b * cg, p.b * sg, 0,
       p.c * cx, p.c * cy, p.c * std::sqrt(cz2);
  return m;
}

double SignedVolume(const Eigen::Matrix3d& lattice) { return lattice.determinant(); }

Eigen::Matrix3d ReciprocalLattice(const Eigen::Matrix3d& lattice) {
  RequireFinite(lattice);
  const double det = lattice.determinant();
  if (det == 0.0 || !std::isfinite(det)) {
    throw InvalidArgument("lattice", "is singular: it has no reciprocal lattice");
  }
  // b1 = (b x c) / det and cyclically: the rows of inverse(lattice)^T.
  Eigen::Matrix3d r;
  r.row(0) = lattice.row(1).cross(lattice.row(2)) / det;
  r.row(1) = lattice.row(2).cross(lattice.row(0)) / det;
  r.row(2) = lattice.row(0).cross(lattice.row(1)) / det;
  return r;
}

Eigen::Vector3d FractionalToCartesian(const Eigen::Matrix3d& lattice, const Eigen::Vector3d& frac) {
  return lattice.transpose() * frac;
}

Eigen::Vector3d CartesianToFractional(const Eigen::Matrix3d& lattice, const Eigen::Vector3d& cart) {
  return lattice.transpose().partialPivLu().solve(cart);
}

double WrapFraction(double x) {
  const double w = x - std::floor(x);
  return w >= 1.0 ? 0.0 : w;
}

Eigen::Vector3d WrapFractional(const Eigen::Vector3d& frac) {
  return {WrapFraction(frac[0]), WrapFraction(frac[1]), WrapFraction(frac[2])};
}

}  // namespace nucleate::structure
