// A structure in its space group's standard setting, in the form the CIF writer takes.
#pragma once

#include "core/structure/crystal.h"
#include "core/structure/io/cif_writer.h"
#include "core/symmetry/symmetry.h"

namespace nucleate::symmetry {

// The idealised conventional cell at the tolerance, its operations and asymmetric unit; sites
// are labelled element + running number ("O1", "O2"). Errors as StandardSettingForCif.
structure::io::SymmetrizedCrystal SymmetrisedForCif(
    const structure::Crystal& crystal, double symprec = kDefaultSymprec,
    double angle_tolerance = kDefaultAngleTolerance);

}  // namespace nucleate::symmetry
