// One structure's report (message StructureReport) from core's checks: validity, formula and
// symmetry. Used by every method that reports on structures (Check, Sample).
#pragma once

#include "core/checks/validity.h"
#include "core/structure/crystal.h"
#include "methods/structure_inputs.h"
#include "nucleate/v1/checks.pb.h"

namespace nucleate::capi {

// Defaults for what is left out (core's defaults are the only defaults).
checks::ValidityThresholds ThresholdsFromMessage(const v1::ValidityThresholds& message);

// Fills num_atoms, validity, geometry, flags, formulas and symmetry (a symmetry search that fails
// becomes a warning). Raises only the refusals of CheckValidity (limits, bad thresholds).
void CheckOne(const structure::Crystal& crystal, const checks::ValidityThresholds& thresholds,
              const InputLimits& limits, double symprec, double angle_tolerance,
              v1::StructureReport* report);

}  // namespace nucleate::capi
