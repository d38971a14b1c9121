#include "core/train/data/prepare_example.h"

#include <cmath>
#include <limits>
#include <utility>

#include "core/common/error.h"
#include "core/structure/composition.h"
#include "core/structure/validate.h"
#include "core/symmetry/symmetry.h"

namespace nucleate::train::data {

TrainingExample PrepareExample(structure::Crystal crystal, const std::string& source,
                               double symprec, const structure::StructureLimits& limits,
                               const std::vector<std::string>& property_names,
                               bool& no_space_group) {
  structure::ValidateCrystal(crystal, limits);
  TrainingExample example;
  example.source = source;
  crystal.label = source;
  // spglib's Niggli reduction with its default tolerance: the basis is reduced, the atoms stay
  // (a conventional cell stays a conventional-size cell, re-expressed in the reduced basis).
  example.crystal = symmetry::NiggliReduce(crystal);
  example.formula = structure::ReducedHillFormula(example.crystal.numbers);
  no_space_group = false;
  try {
    const symmetry::SymmetryInfo info = symmetry::AnalyseSymmetry(example.crystal, symprec);
    example.space_group = info.number;
    // CrystalSystem is declared in the order of the International Tables (triclinic first).
    example.crystal_system = static_cast<int>(info.crystal_system) + 1;
  } catch (const Error& error) {
    // kNumerical is spglib finding no group at this tolerance; anything else is a real defect.
    if (error.kind() != ErrorKind::kNumerical) throw;
    no_space_group = true;
  }
  example.properties.assign(property_names.size(), std::numeric_limits<double>::quiet_NaN());
  for (std::size_t k = 0; k < property_names.size(); ++k) {
    const auto it = example.crystal.properties.find(property_names[k]);
    if (it != example.crystal.properties.end() && std::isfinite(it->second)) {
      example.properties[k] = it->second;
    }
  }
  return example;
}

}  // namespace nucleate::train::data
