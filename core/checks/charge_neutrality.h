// Whether a composition can be charge neutral with each element in one of its common oxidation
// states (core/elements/elements.cc), and the electronegativity order of the assignment found.
#pragma once

#include <cstdint>
#include <string>
#include <vector>

namespace nucleate::checks {

enum class ChargeStatus {
  kNeutral,        // an assignment summing to zero was found
  kNotNeutral,     // the search was complete and found none
  kUndetermined,   // the search would exceed its bounds: no verdict
  kNotApplicable,  // elemental, or no element has a negative common state (metals, intermetallics)
};
const char* ChargeStatusName(ChargeStatus status);  // "neutral", "not_neutral", ...

// Atoms of one element in one state.
struct ElementState {
  int number = 0;
  int state = 0;
  int count = 0;
};

struct ChargeAssignment {
  ChargeStatus status = ChargeStatus::kUndetermined;
  std::string reason;                 // why not neutral / undetermined / not applicable
  bool mixed_valence = false;         // some element's atoms carry different states
  std::vector<ElementState> states;   // by atomic number, then state; empty unless neutral
  // One per site, in site order. Which site of a mixed-valence element carries which state is not
  // determined by composition: they are handed out in site order, lowest state first.
  std::vector<int> site_states;
  // Electronegativity order of the assignment (Pauling, elements.cc): cations should all be less
  // electronegative than every anion. Elements without a tabulated value are not judged.
  bool electronegativity_order_ok = true;
  int most_electronegative_cation = 0;    // atomic number, 0 if none judged
  int least_electronegative_anion = 0;
};

struct ChargeSearchBounds {
  // Single-valence pass: at most this many combinations of one state per element; and the
  // mixed-valence pass: at most this many sign patterns.
  std::int64_t max_combinations = 100000;
  // The mixed-valence pass runs only for cells with at most this many sites.
  std::int64_t max_sites_mixed_valence = 200;
};

// `numbers` are the atomic numbers of the sites (validated by the caller: 1..118). First every atom
// of an element shares one state; among neutral assignments one with the electronegativity order
// right is preferred, then the one with the smallest total |state|. Only if none is neutral, a
// second pass lets atoms of one element take different states of the same sign (Fe2+/Fe3+ in
// Fe3O4; never Cl- with Cl+ in one compound).
ChargeAssignment AssignOxidationStates(const std::vector<int>& numbers,
                                       const ChargeSearchBounds& bounds = {});

}  // namespace nucleate::checks
