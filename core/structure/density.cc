#include "core/structure/density.h"

#include <cmath>

#include "core/elements/elements.h"
#include "core/structure/validate.h"

namespace nucleate::structure {

double Density(const Crystal& crystal, const StructureLimits& limits) {
  ValidateCrystal(crystal, limits);
  double mass = 0;  // amu
  for (int z : crystal.numbers) mass += elements::FindElement(z)->atomic_weight;
  return mass / std::fabs(crystal.lattice.determinant()) * kGramsPerCm3PerAmuPerCubicAngstrom;
}

}  // namespace nucleate::structure
