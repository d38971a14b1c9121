#include "core/match/tolerances.h"

#include "core/common/error.h"
#include "core/common/require.h"

namespace nucleate::match {

void ValidateTolerances(const MatchTolerances& t) {
  RequirePositiveFinite("length_tolerance", t.length_tolerance);
  RequirePositiveFinite("site_tolerance", t.site_tolerance);
  RequirePositiveFinite("angle_tolerance", t.angle_tolerance);
  RequirePositiveFinite("primitive_tolerance", t.primitive_tolerance);
  // Beyond these every reduced cell "matches" every other and the lattice search explodes.
  if (t.length_tolerance >= 1.0) throw InvalidArgument("length_tolerance", "must be < 1");
  if (t.angle_tolerance >= 45.0) throw InvalidArgument("angle_tolerance", "must be < 45 degrees");
  // Displacements of a whole nearest-neighbour spacing would match any two structures.
  if (t.site_tolerance >= 1.0) throw InvalidArgument("site_tolerance", "must be < 1");
}

}  // namespace nucleate::match
