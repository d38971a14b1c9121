// The periodic table data nucleate uses. Each column names its published source in elements.cc.
#pragma once

#include <string>
#include <string_view>
#include <vector>

namespace nucleate::elements {

constexpr int kMaxAtomicNumber = 118;

struct Element {
  int number = 0;
  const char* symbol = "";
  const char* name = "";
  double atomic_weight = 0;          // standard atomic weight, g/mol (NaN where none is defined)
  double covalent_radius = 0;        // angstrom (NaN where none is tabulated)
  double electronegativity = 0;      // Pauling scale (NaN where none is tabulated)
  std::vector<int> common_oxidation_states;
  bool radioactive = false;          // no stable isotope
  bool toxic = false;                // flagged for handling: see elements.cc for the criterion
};

// NULL when `number` is not in 1..118.
const Element* FindElement(int number);
// 0 when `symbol` is not an element symbol. Exact case ("Fe"), as written in CIF and XYZ files.
int AtomicNumber(std::string_view symbol);

// For messages: "Fe (element 26)", or "atomic number 119 (no element)" outside 1..118.
std::string Describe(int number);

}  // namespace nucleate::elements
