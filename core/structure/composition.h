// Chemical formulas of a structure, for reports and for bucketing by composition.
#pragma once

#include <map>
#include <string>
#include <utility>
#include <vector>

namespace nucleate::structure {

// Atom counts by atomic number. InvalidArgument naming "atomic_numbers[i]" outside 1..118.
std::map<int, long long> CountElements(const std::vector<int>& numbers);

// Hill order (Hill 1900, as used by CAS and the CIF _chemical_formula_sum): with carbon, C then H
// then the rest alphabetically; without carbon, all alphabetically. Counts of 1 are not written:
// "O3SrTi", "CH4". Empty for no atoms.
std::string HillFormula(const std::vector<int>& numbers);
// The same from counts by atomic number, terms joined by `separator` (CIF's
// _chemical_formula_sum writes "Cl4 Na4"). Zero counts are left out.
std::string HillFormula(const std::map<int, long long>& counts, const std::string& separator);

// The same with counts divided by their greatest common divisor: "O2Ti" for a 6-atom TiO2 cell.
std::string ReducedHillFormula(const std::vector<int>& numbers);

// A written formula read into (atomic number, count) in order of first appearance, repeated
// elements merged: "SrTiO3", "Li2O", "Ca3(PO4)2" (one or more levels of parentheses), spaces
// ignored ("Sr Ti O3"); a missing count is 1. InvalidArgument naming `field` and the character
// position for an unknown symbol, a count of 0, empty or unbalanced parentheses, or counts above
// 10^6.
std::vector<std::pair<int, int>> ParseFormula(const std::string& formula,
                                              const std::string& field = "formula");

}  // namespace nucleate::structure
