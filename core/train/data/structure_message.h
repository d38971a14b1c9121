// nucleate.v1.Structure -> Crystal for StructureSet files. The C boundary has its own converter
// (capi/src/methods/structure_inputs.cc), but core may not depend on capi, and a dataset file is
// a file format of core (as the model bundle is), so this one-way copy lives here.
#pragma once

#include "core/structure/crystal.h"
#include "nucleate/v1/structure.pb.h"

namespace nucleate::train::data {

// Copies the message as it is; fractional coordinates are wrapped to [0, 1) when finite.
// InvalidArgument("lattice") / ("frac_coords") for the wrong number of values and
// LimitExceeded("atomic_numbers") above limits.max_atoms, checked before allocating; everything
// else (finite numbers, atomic numbers, the cell) is ValidateCrystal's job.
structure::Crystal CrystalFromMessage(const v1::Structure& message,
                                      const structure::StructureLimits& limits);

}  // namespace nucleate::train::data
