// Lattice mappings: the bases of one lattice (or of its superlattices of a given index) that look
// like a target basis within the length and angle tolerances. The first step of matching: every
// way of choosing a cell of structure A that could be structure B's cell.
#pragma once

#include <vector>

#include <Eigen/Dense>

#include "core/match/lattice_points.h"

namespace nucleate::match {

struct LatticeMapping {
  Eigen::Matrix3i coefficients;  // rows: the new basis vectors in the rows of `lattice`
  Eigen::Matrix3d basis;         // coefficients * lattice, Cartesian rows
};

// Every integer matrix M with |det M| = index whose rows v_k = M_k * lattice satisfy, for the
// target rows t_k,
//   1 / (1 + length_tolerance) < |v_k| / |t_k| < 1 + length_tolerance,
//   |angle(v_i, v_j) - angle(t_i, t_j)| < angle_tolerance (degrees) for each pair.
// Both handednesses are kept (det M = +-index), so a structure matches its mirror image: the two
// have the same energy, and the reference treats them alike. `points`, when given, must hold
// every lattice vector of `lattice` up to max |t_k| * (1 + length_tolerance); otherwise they are
// enumerated here. Deterministic order.
std::vector<LatticeMapping> FindLatticeMappings(const Eigen::Matrix3d& lattice,
                                                const Eigen::Matrix3d& target,
                                                double length_tolerance, double angle_tolerance,
                                                int index,
                                                const std::vector<LatticePoint>* points = nullptr);

// Radius out to which FindLatticeMappings needs the points of `lattice` for this target.
double MappingSearchRadius(const Eigen::Matrix3d& target, double length_tolerance);

}  // namespace nucleate::match
