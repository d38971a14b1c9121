// A space-group operation on fractional coordinates, shared by the symmetry analysis and the CIF
// reader and writer.
#pragma once

#include <Eigen/Dense>

namespace nucleate::structure {

// x' = rotation * x + translation, x fractional. Row i of `rotation` gives output coordinate i.
struct SymmetryOperation {
  Eigen::Matrix3i rotation = Eigen::Matrix3i::Identity();
  Eigen::Vector3d translation = Eigen::Vector3d::Zero();

  Eigen::Vector3d Apply(const Eigen::Vector3d& frac) const {
    return rotation.cast<double>() * frac + translation;
  }
};

}  // namespace nucleate::structure
