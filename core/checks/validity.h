// Checks a candidate structure before anyone spends DFT time on it. Each failed rule is a named
// problem with a message naming the sites or elements involved; toxic and radioactive elements
// are flags for the user, not failures.
#pragma once

#include <cstdint>
#include <string>
#include <vector>

#include "core/checks/charge_neutrality.h"
#include "core/structure/crystal.h"
#include "core/structure/periodic_distances.h"

namespace nucleate::checks {

struct ValidityThresholds {
  // No two atoms closer than this (angstrom). The shortest bond in any solid is H-H in solid H2,
  // 0.74 A (from memory); 0.5 A catches atoms placed on top of each other with margin.
  double min_distance = 0.5;
  // Nor closer than this fraction of the sum of their covalent radii (Cordero et al. 2008). Real
  // contacts stay above ~0.75 of the sum even for triple bonds (N2: 1.10 A vs 2 x 0.71; CO: 1.13 A
  // vs 0.76 + 0.66; bond lengths from memory), so 0.5 flags only true overlaps. Elements without a
  // tabulated radius (Z > 96) are skipped. 0 turns the rule off.
  double min_covalent_fraction = 0.5;
  // Volume per atom in A^3. Diamond, the densest common solid at ambient pressure, has 5.67 (a =
  // 3.567 A, 8 atoms); caesium metal, among the loosest, ~116 (bcc, a = 6.14 A, from memory).
  // 5..150 admits both. Common practice, no source.
  double min_volume_per_atom = 5.0;
  double max_volume_per_atom = 150.0;
  // Cell angles (alpha, beta, gamma of the cell as given, degrees) and the ratio of the longest to
  // the shortest cell vector. A generator that emits 15-degree cells or needles 20:1 has usually
  // failed; reduce a legitimately skewed cell before checking. Common practice, no source.
  double min_angle = 20.0;
  double max_angle = 160.0;
  double max_axis_ratio = 15.0;
  // Charge neutrality in common oxidation states, and the electronegativity order of the assignment.
  bool check_charge_neutrality = true;
  bool check_electronegativity_order = true;
  ChargeSearchBounds charge_search;
};

enum class ProblemCode {
  kInvalidStructure,        // counts, degenerate cell, unknown atomic number
  kNonFinite,               // NaN or infinity in the lattice or coordinates
  kMinDistance,             // two atoms (or an atom and its image) closer than min_distance
  kCovalentOverlap,         // closer than min_covalent_fraction of the covalent radii sum
  kVolumePerAtom,           // outside min..max_volume_per_atom
  kLatticeAngle,            // a cell angle outside min..max_angle
  kAxisRatio,               // longest / shortest cell vector above max_axis_ratio
  kChargeNeutrality,        // no neutral assignment of common oxidation states
  kElectronegativityOrder,  // a cation more electronegative than an anion
};
// snake_case names used as message prefixes and in replies: "min_distance", ...
const char* ProblemCodeName(ProblemCode code);

struct Problem {
  ProblemCode code;
  std::string message;
};

struct ValidityResult {
  bool valid = false;
  std::vector<Problem> problems;
  // Geometry, computed when the structure is well formed (NaN / empty otherwise).
  structure::ClosestPair min_distance;
  double volume_per_atom = 0;
  double density = 0;  // g/cm^3
  ChargeAssignment charge;  // status kUndetermined when charge neutrality was not checked
  // Flags, not failures: atomic numbers present, ascending.
  std::vector<int> toxic_elements;
  std::vector<int> radioactive_elements;
};

// InvalidArgument naming the threshold ("min_distance", ...) that is NaN, negative or out of
// order. CheckValidity calls it too; a caller checking many structures may call it once first.
void ValidateThresholds(const ValidityThresholds& thresholds);

// Raises InvalidArgument naming the threshold ("min_distance", ...) for a threshold that is NaN,
// negative or out of order, and LimitExceeded like ValidateCrystal for a structure above `limits`
// (those are refusals of the request; every other defect is reported as a problem).
ValidityResult CheckValidity(const structure::Crystal& crystal,
                             const ValidityThresholds& thresholds = {},
                             const structure::StructureLimits& limits = {});

}  // namespace nucleate::checks
