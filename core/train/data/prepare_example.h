// One structure as read -> one training example: validated, Niggli-reduced, labelled with its
// formula and symmetry.
#pragma once

#include <string>
#include <vector>

#include "core/structure/crystal.h"
#include "core/train/data/training_example.h"

namespace nucleate::train::data {

// Throws what ValidateCrystal and NiggliReduce throw for an unusable structure. A structure in
// which spglib finds no space group at `symprec` is still usable: crystal_system and space_group
// are then 0 and `no_space_group` is set, so the caller can warn. `properties` is filled with NaN
// per name, then with the structure's own finite values (crystal.properties).
TrainingExample PrepareExample(structure::Crystal crystal, const std::string& source,
                               double symprec, const structure::StructureLimits& limits,
                               const std::vector<std::string>& property_names,
                               bool& no_space_group);

}  // namespace nucleate::train::data
