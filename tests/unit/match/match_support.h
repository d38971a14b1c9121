// Crystals and rewrites for the match tests: textbook structures (shared with the symmetry tests,
// each naming its source there), a change of basis, a homogeneous strain, random rotations and
// random low-symmetry cells.
#pragma once

#include <cmath>
#include <stdexcept>
#include <string>

#include <Eigen/Dense>

#include "core/structure/crystal.h"
#include "core/structure/lattice.h"
#include "tests/unit/symmetry/structure_transforms.h"
#include "tests/unit/symmetry/textbook_structures.h"

namespace nucleate::match::testing {

using structure::Crystal;
using symmetry::testing::Uniform;

inline Crystal Textbook(const std::string& name) {
  for (const auto& t : symmetry::testing::TextbookStructures()) {
    if (t.name == name) return t.crystal;
  }
  throw std::invalid_argument("no textbook structure " + name);
}

// The same crystal described by the basis rows U * L (U integer, det +-1): a different cell choice.
inline Crystal ChangeBasis(const Crystal& c, const Eigen::Matrix3i& u) {
  Crystal out = c;
  out.lattice = u.cast<double>() * c.lattice;
  const Eigen::Matrix3d map = u.cast<double>().inverse().transpose();
  for (auto& f : out.frac) f = structure::WrapFractional(map * f);
  return out;
}

// Homogeneous deformation x -> (I + e) x of every Cartesian position (fractional coordinates kept).
inline Crystal Strain(const Crystal& c, const Eigen::Matrix3d& e) {
  Crystal out = c;
  out.lattice = c.lattice * (Eigen::Matrix3d::Identity() + e).transpose();
  return out;
}

// Uniformly random rotation (unit quaternion from three uniforms, Shoemake 1992).
inline Eigen::Matrix3d RandomRotation(Uniform& u) {
  const double u1 = u.Next(), u2 = u.Next() * 2 * M_PI, u3 = u.Next() * 2 * M_PI;
  Eigen::Quaterniond q(std::sqrt(u1) * std::cos(u3), std::sqrt(1 - u1) * std::sin(u2),
                       std::sqrt(1 - u1) * std::cos(u2), std::sqrt(u1) * std::sin(u3));
  return q.normalized().toRotationMatrix();
}

// A random low-symmetry cell of `numbers`, atoms kept at least min_distance apart (resampled).
inline Crystal RandomCrystal(const std::vector<int>& numbers, Uniform& u, double volume_per_atom,
                             double min_distance = 1.6) {
  structure::LatticeParameters p;
  p.a = 1 + u.Next();
  p.b = 1 + u.Next();
  p.c = 1 + u.Next();
  p.alpha = 75 + 30 * u.Next();
  p.beta = 75 + 30 * u.Next();
  p.gamma = 75 + 30 * u.Next();
  Eigen::Matrix3d l = structure::MatrixFromParameters(p);
  l *= std::cbrt(volume_per_atom * numbers.size() / std::abs(l.determinant()));
  Crystal c;
  c.lattice = l;
  for (int z : numbers) {
    for (int attempt = 0;; ++attempt) {
      const Eigen::Vector3d f(u.Next(), u.Next(), u.Next());
      bool ok = true;
      for (const auto& g : c.frac) {
        for (int i = -1; i <= 1 && ok; ++i)
          for (int j = -1; j <= 1 && ok; ++j)
            for (int k = -1; k <= 1 && ok; ++k) {
              const Eigen::Vector3d d = (f - g + Eigen::Vector3d(i, j, k)).transpose() * l;
              ok = d.norm() >= min_distance;
            }
      }
      if (ok || attempt > 1000) {
        c.numbers.push_back(z);
        c.frac.push_back(f);
        break;
      }
    }
  }
  return c;
}

}  // namespace nucleate::match::testing
