// When two crystals count as "the same": the tolerances shared by the matcher, the fingerprint
// screen and deduplication.
#pragma once

namespace nucleate::match {

// The default values are common practice in the field for structure comparison (they are the
// defaults of pymatgen's StructureMatcher, which tests/reference/match uses as the outside
// reference).
struct MatchTolerances {
  // Each mapped cell vector's length must lie within a factor (1 + length_tolerance) of the
  // corresponding target vector's length, either way.
  double length_tolerance = 0.2;
  // Largest allowed site displacement after removing the mean shift, in units of (V/N)^(1/3)
  // (V the volume of the averaged cell, N its site count), so the tolerance means the same for
  // dense and open structures.
  double site_tolerance = 0.3;
  // Largest allowed difference of each cell angle, degrees.
  double angle_tolerance = 5.0;
  // Reduce both structures to a primitive cell first, so a conventional cell matches its
  // primitive cell and any supercell matches its parent.
  bool primitive_cell = true;
  // Rescale both cells to the same volume per atom before comparing (a compressed copy matches).
  bool scale_volume = true;
  // Let a structure match a supercell of the other when the compared cells' site counts differ
  // by an integer factor: the smaller cell's lattice is searched for superlattices of that index
  // that map onto the larger cell (see lattice_mapping.h). Only needed when primitive_cell is
  // false or when a distortion hides the smaller period from the primitive-cell search.
  bool allow_supercell = false;
  // How far (angstrom, along each cell axis) a pure translation may carry an atom from one of the
  // same element for the primitive-cell search to accept it. 0.25 A is the value the reference
  // (pymatgen's get_primitive_structure) uses, so both reduce the same noisy supercells.
  double primitive_tolerance = 0.25;
};

// InvalidArgument naming the field for a tolerance that is not positive and finite, or a length
// tolerance or angle tolerance so large that "matching" loses meaning (>= 1, >= 45 degrees).
void ValidateTolerances(const MatchTolerances& tolerances);

}  // namespace nucleate::match
