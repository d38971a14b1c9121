// LLL reduction of a lattice, used only to make periodic distance searches short: a reduced basis
// is nearly orthogonal, so the provable image bound in periodic_distances.cc stays a handful of
// images however skewed the cell a caller hands in. It is not a Niggli reduction and its result is
// not a conventional cell (core/symmetry owns those).
#pragma once

#include <Eigen/Dense>

namespace nucleate::structure {

struct ReducedLattice {
  Eigen::Matrix3d lattice;          // rows a', b', c'
  Eigen::Matrix3i transform;        // lattice = transform * original (integer, det +-1)
  Eigen::Matrix3i inverse;          // original = inverse * lattice
};

// Lenstra-Lenstra-Lovasz reduction (Lovasz parameter 0.99) of the rows. Raises
// InvalidArgument("lattice[k]") for a non-finite entry, InvalidArgument("lattice") for a singular
// lattice, Numerical("lattice") if it does not converge (not seen for lattices that pass
// ValidateCrystal).
ReducedLattice ReduceLattice(const Eigen::Matrix3d& lattice);

}  // namespace nucleate::structure
