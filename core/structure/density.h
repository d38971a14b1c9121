// Mass density of a crystal from the standard atomic weights in core/elements.
#pragma once

#include "core/structure/crystal.h"

namespace nucleate::structure {

// g/cm^3 per (amu / A^3): 1 u = 1.66053906660e-27 kg (CODATA 2018), 1 A^3 = 1e-24 cm^3.
constexpr double kGramsPerCm3PerAmuPerCubicAngstrom = 1.66053906660;

// Sum of standard atomic weights (elements.cc: conventional values for interval elements, the
// longest-lived isotope's mass number where IUPAC defines none) over |det(lattice)|, in g/cm^3.
// Validates the crystal against `limits`.
double Density(const Crystal& crystal, const StructureLimits& limits = {});

}  // namespace nucleate::structure
