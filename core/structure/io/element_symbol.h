// Element symbols as they appear in structure files, to atomic numbers.
#pragma once

#include <string_view>

namespace nucleate::structure::io {

// A CIF _atom_site_type_symbol: the element symbol, any letter case ("FE" and "fe" are iron, as
// older CIFs write them), optionally followed by an oxidation state made of digits and signs
// ("Fe3+", "O2-", "Na+"). 0 when it is not an element.
int AtomicNumberFromTypeSymbol(std::string_view text);

// A CIF _atom_site_label such as "Fe1", "O2-" or "Ca1a": the leading letters name the element.
// A two-letter symbol is taken only when its second letter is lower case ("Co1" is cobalt, while
// "CO1" or "OW1" start with the one-letter symbol: common practice, no source). 0 when the
// leading letters name no element.
int AtomicNumberFromSiteLabel(std::string_view text);

// The alphabetic prefix used above, for error messages ("Xx" from "Xx1").
std::string_view LeadingLetters(std::string_view text);

}  // namespace nucleate::structure::io
