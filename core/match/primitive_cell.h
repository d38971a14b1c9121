// The primitive cell of a crystal, found from its pure translations: vectors that carry every
// atom onto an atom of the same element. The matcher needs it so that a conventional cell, a
// supercell and a primitive cell of one structure compare as equal.
#pragma once

#include "core/structure/crystal.h"

namespace nucleate::match {

// The smallest cell the pure translations allow, with each orbit of translated atoms merged into
// one site at their mean position. `tolerance` (angstrom) is how far a translated atom may land
// from its partner. Returns the input unchanged (same lattice, same sites) when no translation
// other than the lattice's own is found, or when the translations found at this tolerance are not
// a consistent group (noise right at the tolerance): the matcher then compares the larger cell,
// which is never wrong, only slower. The crystal must have passed ValidateCrystal.
structure::Crystal PrimitiveCell(const structure::Crystal& crystal, double tolerance);

}  // namespace nucleate::match
