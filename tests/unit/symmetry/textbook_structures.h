// Textbook crystal structures built from their Wyckoff positions, shared by the symmetry unit
// tests and the python3-spglib reference dump. Each structure names where its positions and its
// free parameters come from.
#pragma once

#include <string>
#include <vector>

#include <Eigen/Dense>

#include "core/structure/crystal.h"

namespace nucleate::symmetry::testing {

// Cell vectors as rows from lattice parameters (angstrom, degrees): a along x, b in the xy plane.
Eigen::Matrix3d LatticeFromParameters(double a, double b, double c, double alpha, double beta,
                                      double gamma);

// "x+1/2,-y,z" with the free parameters substituted; terms are x, y, z with an optional integer
// factor, fractions p/q and decimals. Throws std::invalid_argument on anything else.
Eigen::Vector3d EvaluateTriplet(const std::string& triplet, double x, double y, double z);

// One occupied Wyckoff position: its coordinate triplets as printed in the International Tables
// (without the centring translations) and the values of its free parameters.
struct WyckoffSite {
  int number;                           // atomic number
  int multiplicity;                     // as in the Tables: checked against the expansion
  std::vector<std::string> triplets;
  double x = 0, y = 0, z = 0;
};

// Expands the sites with the centring translations, wraps to [0, 1) and removes duplicates.
// Throws std::logic_error if a site does not expand to its multiplicity (a typing error).
structure::Crystal BuildFromWyckoff(const Eigen::Matrix3d& lattice,
                                    const std::vector<Eigen::Vector3d>& centring,
                                    const std::vector<WyckoffSite>& sites,
                                    const std::string& label);

struct Textbook {
  std::string name;
  structure::Crystal crystal;
  int number;                           // space-group number, International Tables Vol. A
  std::string symbol;                   // short symbol as spglib spells it ("P6_3mc")
  // Acceptable Wyckoff descriptions, each "Z:letter Z:letter ..." sorted by atomic number then
  // letter; several when an origin shift of the normaliser relabels the positions.
  std::vector<std::string> wyckoff_alternatives;
  std::string source;
};

std::vector<Textbook> TextbookStructures();

}  // namespace nucleate::symmetry::testing
