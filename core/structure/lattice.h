// Cell geometry: lattice parameters, volume, reciprocal lattice, fractional <-> Cartesian.
// A lattice is a 3x3 matrix whose rows are the cell vectors a, b, c in Cartesian angstrom.
#pragma once

#include <Eigen/Dense>

namespace nucleate::structure {

struct LatticeParameters {
  double a = 0, b = 0, c = 0;              // angstrom
  double alpha = 0, beta = 0, gamma = 0;   // degrees: alpha = angle(b, c), beta = (a, c), gamma = (a, b)
};

// Lengths and angles of the rows. Raises InvalidArgument("lattice") for a non-finite entry or a
// zero-length vector.
LatticeParameters ParametersFromMatrix(const Eigen::Matrix3d& lattice);

// The matrix in standard orientation: a along +x, b in the xy plane with positive y, c with
// positive z (so the result is right-handed). Raises InvalidArgument naming "a".."gamma" for a
// length that is not positive and finite or an angle outside (0, 180), and "gamma" when the three
// angles cannot close a cell (e.g. alpha + beta < gamma).
Eigen::Matrix3d MatrixFromParameters(const LatticeParameters& p);

// det(lattice): positive for a right-handed cell, negative for a left-handed one. Callers that need
// the volume take the absolute value; those that care about handedness can see it here.
double SignedVolume(const Eigen::Matrix3d& lattice);

// Rows b1, b2, b3 with a_i . b_j = delta_ij (crystallographer's convention, no factor 2*pi).
// |b_i| is the inverse spacing of the lattice planes parallel to the other two cell vectors.
// Raises InvalidArgument("lattice") for a singular lattice.
Eigen::Matrix3d ReciprocalLattice(const Eigen::Matrix3d& lattice);

// x = f_1 a + f_2 b + f_3 c.
Eigen::Vector3d FractionalToCartesian(const Eigen::Matrix3d& lattice, const Eigen::Vector3d& frac);
// The inverse, by an LU solve (no explicit inverse). Caller guarantees a non-singular lattice.
Eigen::Vector3d CartesianToFractional(const Eigen::Matrix3d& lattice, const Eigen::Vector3d& cart);

// x - floor(x), but never 1.0: for tiny negative x (-1e-17) the subtraction rounds to exactly 1.0,
// which would put the site on the far face; such results become 0. NaN stays NaN (validation
// reports it with the site index; wrapping cannot).
double WrapFraction(double x);
Eigen::Vector3d WrapFractional(const Eigen::Vector3d& frac);

}  // namespace nucleate::structure
