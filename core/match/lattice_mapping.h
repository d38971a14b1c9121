// Lattice mappings: the bases of one lattice (or of its superlattices of a given index) that look
// like a target basis within the length and angle tolerances. The first step of matching: every
// way of choosing a cell of structure A that could be structure B's cell.
#pragma once

#include <cmath>
#include <cstddef>
#include <vector>

#include <Eigen/Dense>

#include "core/match/lattice_points.h"

namespace nucleate::match {

struct LatticeMapping {
  Eigen::Matrix3i coefficients;  // rows: the new basis vectors in the rows of `lattice`
  Eigen::Matrix3d basis;         // coefficients * lattice, Cartesian rows
};

// The angle between x and y (lengths lx, ly) in degrees: the one arithmetic every lattice
// comparison of match/ uses (FindLatticeMappings, MappingTest, LatticeIndex), so that the screen
// and the matcher see bit for bit the same angle for the same vectors.
double AngleDegrees(const Eigen::Vector3d& x, const Eigen::Vector3d& y, double lx, double ly);

// A basis of a lattice found by a search, with its lengths and angles computed by AngleDegrees
// (angle[0] = alpha between rows 1 and 2, angle[1] = beta (0, 2), angle[2] = gamma (0, 1)).
struct CandidateBasis {
  LatticeMapping mapping;
  double length[3];
  double angle[3];
};

// The test of FindLatticeMappings against one target basis t, for one candidate basis v:
//   1 / (1 + length_tolerance) < |v_k| / |t_k| < 1 + length_tolerance,
//   |angle_k(v) - angle_k(t)| < angle_tolerance (degrees), angles indexed as in CandidateBasis.
class MappingTest {
 public:
  MappingTest(const Eigen::Matrix3d& target, double length_tolerance, double angle_tolerance);

  bool LengthFits(int k, double length) const {
    const double ratio = length / length_[k];
    return ratio > lo_ && ratio < hi_;
  }
  bool AngleFits(int k, double degrees) const {
    return std::abs(degrees - angle_[k]) < angle_tolerance_;
  }
  // Every length and angle fits (the determinant, FindLatticeMappings' last test, is not checked).
  bool Accepts(const CandidateBasis& v) const;

  double angle(int k) const { return angle_[k]; }

 private:
  double length_[3], angle_[3];
  double lo_, hi_, angle_tolerance_;
};

// Slack of CosineWindow: far above the rounding of acos and of the window's own cosines, so the
// window never rejects an angle inside; an angle within ~1e-7 degrees of the edge may pass it.
constexpr double kCosineSlack = 1e-9;

// The cosine window (lo, hi) such that an angle computed by AngleDegrees from a cosine c (before
// its clamping to [-1, 1]) can lie in the open window (from_degrees, to_degrees) only if
// lo < c < hi: the window mapped through cos (decreasing), widened by kCosineSlack; ends beyond 0
// or 180 degrees leave that side open. A cheap necessary test that spares most acos calls.
void CosineWindow(double from_degrees, double to_degrees, double* lo, double* hi);

// Searches for cells (FindLatticeMappings, LatticeIndex::Query) refuse, LimitExceeded on
// "lattice", when more combinations of candidate cell vectors than these would have to be tried:
// triples of rows, or pairs (tables of pair angles are kept).
constexpr double kMaxMappingTriples = 1e8;
constexpr double kMaxMappingPairs = 1e7;
void CheckMappingSearchSize(std::size_t n0, std::size_t n1, std::size_t n2);

// Every integer matrix M with |det M| = index whose rows v_k = M_k * lattice pass MappingTest
// against the target rows t_k. Both handednesses are kept (det M = +-index), so a structure
// matches its mirror image: the two have the same energy, and the reference treats them alike.
// `points`, when given, must hold every lattice vector of `lattice` up to
// max |t_k| * (1 + length_tolerance); otherwise they are enumerated here. Deterministic order.
std::vector<LatticeMapping> FindLatticeMappings(const Eigen::Matrix3d& lattice,
                                                const Eigen::Matrix3d& target,
                                                double length_tolerance, double angle_tolerance,
                                                int index,
                                                const std::vector<LatticePoint>* points = nullptr);

// Radius out to which FindLatticeMappings needs the points of `lattice` for this target.
double MappingSearchRadius(const Eigen::Matrix3d& target, double length_tolerance);

}  // namespace nucleate::match
