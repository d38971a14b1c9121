// The lattice as the denoiser sees it (core/model/DESIGN.md, "Lattice"): six numbers from the
// matrix logarithm of the metric tensor, shifted by the cell's atom count, then standardised with
// the training set's statistics. Every 6-vector maps back to a valid cell, so the diffusion needs
// no constraint, and rotations of the Cartesian frame change nothing.
#pragma once

#include <vector>

#include <Eigen/Dense>

namespace nucleate::model {

// (S00 - c, S11 - c, S22 - c, sqrt2 S12, sqrt2 S02, sqrt2 S01) with S = logm(L L^T) and
// c = (2/3) ln N. The sqrt 2 makes the Euclidean norm of the 6-vector the Frobenius norm of S - cI,
// so isotropic Gaussian noise on the six numbers is isotropic noise on the symmetric matrix.
using LatticeFeatures = Eigen::Matrix<double, 6, 1>;

// Rows of `lattice` are a, b, c (angstrom). InvalidArgument("lattice[k]") for a non-finite entry,
// InvalidArgument("lattice") for a degenerate cell (|det| <= 1e-9 |a| |b| |c|, the test of
// ValidateCrystal), InvalidArgument("atom_count") below 1.
// Handedness is lost (the metric of a mirrored cell is the same).
LatticeFeatures LatticeToFeatures(const Eigen::Matrix3d& lattice, int atom_count);

// The cell whose metric tensor is expm(S), in standard orientation: a along +x, b in the xy plane
// with positive y, c with positive z (the Cholesky factor of G; right-handed).
// InvalidArgument("features[k]") for a non-finite entry, InvalidArgument("atom_count") below 1,
// Numerical("features") when the cell cannot be represented (exp overflows or underflows, or the
// result fails the volume test of ValidateCrystal: |det| <= 1e-9 |a| |b| |c|).
Eigen::Matrix3d FeaturesToLattice(const LatticeFeatures& features, int atom_count);

// Per-entry mean and standard deviation of the features over a training set.
struct LatticeStatistics {
  LatticeFeatures mean = LatticeFeatures::Zero();
  LatticeFeatures std = LatticeFeatures::Ones();

  // (features - mean) / std and its inverse. InvalidArgument("mean[k]") / ("std[k]") when the
  // statistics are not finite or a std is not > 0 (statistics read from a damaged bundle).
  LatticeFeatures Standardise(const LatticeFeatures& features) const;
  LatticeFeatures Unstandardise(const LatticeFeatures& standardised) const;
};

// A std below this is raised to it. A set of cubic cells has exactly zero spread in the three
// off-diagonal numbers (and a set of one cell in all six): dividing by zero is undefined. The
// features are natural logarithms of the metric, so unit standard noise on a floored entry moves
// the metric by 1e-3 relative (cell lengths by 0.05%): far below any physical distinction, and the
// standardised value of such an entry over the training set stays exactly 0.
constexpr double kMinLatticeFeatureStd = 1e-3;

struct SizedLattice {
  Eigen::Matrix3d lattice;  // rows a, b, c, angstrom
  int atom_count = 0;
};

// Population mean and standard deviation (divided by n, not n - 1: this is a normalisation, not
// an estimate, and it stays defined for one cell), std floored at kMinLatticeFeatureStd.
// InvalidArgument("cells") when empty; the errors of LatticeToFeatures with field "cells[i]...".
LatticeStatistics ComputeLatticeStatistics(const std::vector<SizedLattice>& cells);

}  // namespace nucleate::model
