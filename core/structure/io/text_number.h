// Locale-independent number reading and writing for the text formats (CIF, extended XYZ).
// strtod/printf follow the C locale the host program may have changed (a Fortran driver running
// under de_DE would read "5,431"); std::from_chars/to_chars never do.
#pragma once

#include <optional>
#include <string>
#include <string_view>

#include "core/common/shortest_number.h"

namespace nucleate::structure::io {

// A plain decimal number ("-1.5", ".5", "5.", "1e-3", "+2"): the whole text must be the number.
// Returns nullopt for anything else, including "nan", "inf", hex and empty text.
std::optional<double> ParseDecimal(std::string_view text);

// A CIF 1.1 numeric value: a decimal number optionally followed by a standard uncertainty in
// parentheses, "5.431(2)" -> 5.431 (CIF 1.1 specification, numeric values: the standard
// uncertainty is appended in parentheses and is not part of the value). Nullopt otherwise.
std::optional<double> ParseCifNumber(std::string_view text);

// Fixed notation with `decimals` digits after the point; "-0.00000000" is written as "0.00000000"
// so that a value that rounds to zero does not carry a stray sign.
std::string FormatFixed(double value, int decimals);

// The shortest text that reads back to exactly the same double (core/common/shortest_number.h).
using nucleate::FormatShortest;

}  // namespace nucleate::structure::io
