// Space groups of the corpus's structure types: a few generators in the x,y,z form of the
// International Tables for Crystallography, Vol. A, closed into the whole group, and the orbit
// (the Wyckoff position) of a representative point.
#pragma once

#include <string>
#include <vector>

#include <Eigen/Dense>

#include "core/structure/symmetry_operation.h"

namespace nucleate::demo::corpus {

// Lattice centring of the conventional cell, and the primitive cell it reduces to.
enum class Centring { kP, kC, kI, kF, kR };  // R: rhombohedral lattice on hexagonal axes (obverse)

struct SpaceGroup {
  int number = 0;                       // 1..230, International Tables
  const char* symbol = "";              // Hermann-Mauguin, e.g. "Fd-3m"
  const char* setting = "";             // origin choice or axes where the Tables give several
  Centring centring = Centring::kP;
  std::vector<const char*> generators;  // x,y,z form; the centring translations are added
  int order = 0;                        // general-position multiplicity of the conventional cell
};

// Every operation of the group in the conventional cell, translations in [0, 1), identity first.
// Raises nucleate::Error (kInternal) naming the group when the closure does not have
// `group.order` operations: a mistyped generator must stop the tool, not skew the corpus.
std::vector<structure::SymmetryOperation> ExpandGroup(const SpaceGroup& group);

// The distinct images of `point` under `operations`, wrapped to [0, 1), in order of first
// appearance. Two images closer than 1e-6 in every fractional coordinate (modulo 1) are one.
std::vector<Eigen::Vector3d> Orbit(const std::vector<structure::SymmetryOperation>& operations,
                                   const Eigen::Vector3d& point);

// Rows: the primitive cell vectors in units of the conventional ones (L_primitive = P * L_conv,
// both as row lattices). Identity for P.
Eigen::Matrix3d PrimitiveTransform(Centring centring);

// "Fm-3m (225)" for messages.
std::string Describe(const SpaceGroup& group);

}  // namespace nucleate::demo::corpus
