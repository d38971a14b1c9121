#include "tests/unit/symmetry/structure_transforms.h"

#include <algorithm>
#include <cmath>
#include <numeric>
#include <stdexcept>

namespace nucleate::symmetry::testing {

using structure::Crystal;

namespace {
double Wrap(double x) {
  const double w = x - std::floor(x);
  return w >= 1.0 ? 0.0 : w;
}
Eigen::Vector3d WrapVector(const Eigen::Vector3d& v) {
  return Eigen::Vector3d(Wrap(v[0]), Wrap(v[1]), Wrap(v[2]));
}
}  // namespace

Crystal RotateFrame(const Crystal& c, const Eigen::Matrix3d& rotation) {
  Crystal out = c;
  out.lattice = c.lattice * rotation.transpose();
  return out;
}

Eigen::Matrix3d AxisAngle(const Eigen::Vector3d& axis, double angle) {
  return Eigen::AngleAxisd(angle, axis.normalized()).toRotationMatrix();
}

Crystal Translate(const Crystal& c, const Eigen::Vector3d& shift) {
  Crystal out = c;
  for (auto& f : out.frac) f = WrapVector(f + shift);
  return out;
}

Crystal Permute(const Crystal& c, std::uint64_t seed) {
  std::vector<std::size_t> order(c.size());
  std::iota(order.begin(), order.end(), 0);
  Uniform u(seed);
  // Fisher-Yates with our portable generator (std::shuffle's result differs between libraries).
  for (std::size_t i = order.size(); i > 1; --i)
    std::swap(order[i - 1], order[static_cast<std::size_t>(u.Below(static_cast<int>(i)))]);
  Crystal out = c;
  for (std::size_t i = 0; i < order.size(); ++i) {
    out.numbers[i] = c.numbers[order[i]];
    out.frac[i] = c.frac[order[i]];
  }
  return out;
}

Crystal Supercell(const Crystal& c, const Eigen::Matrix3i& m) {
  const int det = static_cast<int>(std::lround(m.cast<double>().determinant()));
  if (det <= 0) throw std::invalid_argument("supercell matrix needs a positive determinant");
  const Eigen::Matrix3d md = m.cast<double>();
  const Eigen::Matrix3d inv = md.inverse();
  Crystal out;
  out.label = c.label;
  out.lattice = md * c.lattice;
  // Old fractional f (row) -> new fractional f M^-1. Enumerate lattice translations n in a box
  // large enough to cover the supercell and keep the distinct images.
  int reach = 0;
  for (int i = 0; i < 3; ++i)
    for (int j = 0; j < 3; ++j) reach = std::max(reach, std::abs(m(i, j)));
  reach *= 3;
  for (std::size_t a = 0; a < c.size(); ++a) {
    std::vector<Eigen::Vector3d> images;
    for (int i = -reach; i <= reach && static_cast<int>(images.size()) < det; ++i)
      for (int j = -reach; j <= reach; ++j)
        for (int k = -reach; k <= reach; ++k) {
          const Eigen::Vector3d f = c.frac[a] + Eigen::Vector3d(i, j, k);
          const Eigen::Vector3d g = WrapVector(inv.transpose() * f);
          bool seen = false;
          for (const auto& e : images) {
            Eigen::Vector3d d = g - e;
            for (int t = 0; t < 3; ++t) d[t] -= std::round(d[t]);
            if (d.norm() < 1e-8) seen = true;
          }
          if (!seen) images.push_back(g);
        }
    if (static_cast<int>(images.size()) != det)
      throw std::logic_error("supercell enumeration missed images");
    for (const auto& g : images) {
      out.numbers.push_back(c.numbers[a]);
      out.frac.push_back(g);
    }
  }
  return out;
}

Crystal Perturb(const Crystal& c, double amplitude, std::uint64_t seed) {
  Uniform u(seed);
  Crystal out = c;
  const Eigen::Matrix3d inv = c.lattice.inverse();
  for (auto& f : out.frac) {
    // A direction uniform on the sphere (Archimedes: z uniform in [-1, 1], azimuth uniform).
    const double z = 2 * u.Next() - 1, phi = 2 * 3.14159265358979323846 * u.Next();
    const double s = std::sqrt(1 - z * z);
    const Eigen::Vector3d cart(amplitude * s * std::cos(phi), amplitude * s * std::sin(phi),
                               amplitude * z);
    // Rows: cart = f^T L, so a Cartesian step d moves f by (d^T L^-1)^T.
    f = WrapVector(f + inv.transpose() * cart);
  }
  return out;
}

}  // namespace nucleate::symmetry::testing
