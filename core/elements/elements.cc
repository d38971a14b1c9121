// The periodic table nucleate uses, one line per element. Sources, column by column:
//
// atomic_weight: IUPAC/CIAAW standard atomic weights 2021 (Prohaska et al., Pure Appl. Chem. 94
//   (2022) 573), typed from memory. Elements whose standard atomic weight is an interval (H, Li, B,
//   C, N, O, Mg, Si, S, Cl, Ar, Br, Tl, Pb) carry the IUPAC conventional value. Elements with no
//   standard atomic weight (no stable isotope and no characteristic terrestrial composition: Tc, Pm,
//   Po..Ac, Np and beyond) carry the mass number of the longest-lived known isotope, the value IUPAC
//   prints in brackets, from memory. We chose a number over NaN so that a density can always be
//   computed for a generated candidate; the value is within ~1% of any isotope's mass.
//   tests/reference/structure/element_tables_reference.py checks every weight against Debian's
//   python3-ase (IUPAC 2016 table) and lists the few revisions since 2016.
// covalent_radius: Cordero et al., "Covalent radii revisited", Dalton Trans. 2008, 2832-2838,
//   Table 2, single values, Z = 1..96 (NaN beyond: not tabulated). C is the sp3 value 0.76. Mn, Fe,
//   Co carry the HIGH-spin values (1.61, 1.52, 1.50; low spin 1.39, 1.32, 1.26): in oxides and
//   fluorides, where most generated candidates live, these ions are usually high spin, and the larger
//   radius makes the "too close" check more conservative. Typed from memory and checked against
//   ase.data.covalent_radii (which cites the same table) by the reference test.
// electronegativity: Pauling scale as tabulated in the CRC Handbook of Chemistry and Physics
//   ("Electronegativity" table), from memory; NaN where none is tabulated (He, Ne, Ar, Rn and the
//   elements beyond No). Pm 1.13, Eu 1.2, Tb 1.1 and Yb 1.1, which we did not remember from the
//   CRC table, are the values pymatgen's Element.X gives (Debian python3-pymatgen): without them
//   the electronegativity-order check would be blind for these lanthanides. Every value is
//   cross-checked against Element.X by the reference test.
// common_oxidation_states: the most common oxidation states in compounds as listed in Greenwood &
//   Earnshaw, "Chemistry of the Elements", 2nd ed. (1997), typed from memory, so treat them as
//   "from memory". Mn3+ and Ni3+ are kept because they are common in oxides (LaMnO3, LiNiO2).
//   Noble gases and the elements beyond Lr have none. The reference test checks that every state
//   listed here is a known state in pymatgen's Element.oxidation_states.
// radioactive: no stable isotope: Tc, Pm and Z >= 84 (Bi-209 decays, but with a half-life ~1e19
//   years it is treated as stable, as IUPAC does).
// toxic: a flag for the user's attention, not advice. Criterion: the element is restricted in all
//   of its compounds by EU RoHS Directive 2011/65/EU Annex II (Pb, Hg, Cd), or IARC classifies "the
//   element and its compounds" as Group 1 carcinogens (Be, Cd, As), or its ordinary salts are
//   acute poisons at milligram doses whose sale is restricted by name (Tl: thallium sulfate
//   rodenticide bans). Regulatory facts from memory. Elements toxic only in one oxidation state
//   (Cr(VI)) or only as a few compounds (OsO4, nickel compounds) are not flagged.
#include "core/elements/elements.h"

#include <limits>
#include <string_view>

namespace nucleate::elements {
namespace {

constexpr double kNone = std::numeric_limits<double>::quiet_NaN();
constexpr bool R = true;   // radioactive
constexpr bool T = true;   // toxic
constexpr bool no = false;

// Z, symbol, name, atomic weight, covalent radius, Pauling electronegativity, common oxidation
// states, radioactive, toxic.
const Element kTable[kMaxAtomicNumber] = {
    {1, "H", "Hydrogen", 1.008, 0.31, 2.20, {-1, 1}, no, no},
    {2, "He", "Helium", 4.002602, 0.28, kNone, {}, no, no},
    {3, "Li", "Lithium", 6.94, 1.28, 0.98, {1}, no, no},
    {4, "Be", "Beryllium", 9.0121831, 0.96, 1.57, {2}, no, T},
    {5, "B", "Boron", 10.81, 0.84, 2.04, {3}, no, no},
    {6, "C", "Carbon", 12.011, 0.76, 2.55, {-4, 2, 4}, no, no},
    {7, "N", "Nitrogen", 14.007, 0.71, 3.04, {-3, 3, 5}, no, no},
    {8, "O", "Oxygen", 15.999, 0.66, 3.44, {-2}, no, no},
    {9, "F", "Fluorine", 18.998403163, 0.57, 3.98, {-1}, no, no},
    {10, "Ne", "Neon", 20.1797, 0.58, kNone, {}, no, no},
    {11, "Na", "Sodium", 22.98976928, 1.66, 0.93, {1}, no, no},
    {12, "Mg", "Magnesium", 24.305, 1.41, 1.31, {2}, no, no},
    {13, "Al", "Aluminium", 26.9815384, 1.21, 1.61, {3}, no, no},
    {14, "Si", "Silicon", 28.085, 1.11, 1.90, {-4, 4}, no, no},
    {15, "P", "Phosphorus", 30.973761998, 1.07, 2.19, {-3, 3, 5}, no, no},
    {16, "S", "Sulfur", 32.06, 1.05, 2.58, {-2, 2, 4, 6}, no, no},
    {17, "Cl", "Chlorine", 35.45, 1.02, 3.16, {-1, 1, 3, 5, 7}, no, no},
    {18, "Ar", "Argon", 39.95, 1.06, kNone, {}, no, no},
    {19, "K", "Potassium", 39.0983, 2.03, 0.82, {1}, no, no},
    {20, "Ca", "Calcium", 40.078, 1.76, 1.00, {2}, no, no},
    {21, "Sc", "Scandium", 44.955907, 1.70, 1.36, {3}, no, no},
    {22, "Ti", "Titanium", 47.867, 1.60, 1.54, {2, 3, 4}, no, no},
    {23, "V", "Vanadium", 50.9415, 1.53, 1.63, {2, 3, 4, 5}, no, no},
    {24, "Cr", "Chromium", 51.9961, 1.39, 1.66, {2, 3, 6}, no, no},
    {25, "Mn", "Manganese", 54.938043, 1.61, 1.55, {2, 3, 4, 7}, no, no},
    {26, "Fe", "Iron", 55.845, 1.52, 1.83, {2, 3}, no, no},
    {27, "Co", "Cobalt", 58.933194, 1.50, 1.88, {2, 3}, no, no},
    {28, "Ni", "Nickel", 58.6934, 1.24, 1.91, {2, 3}, no, no},
    {29, "Cu", "Copper", 63.546, 1.32, 1.90, {1, 2}, no, no},
    {30, "Zn", "Zinc", 65.38, 1.22, 1.65, {2}, no, no},
    {31, "Ga", "Gallium", 69.723, 1.22, 1.81, {3}, no, no},
    {32, "Ge", "Germanium", 72.630, 1.20, 2.01, {-4, 2, 4}, no, no},
    {33, "As", "Arsenic", 74.921595, 1.19, 2.18, {-3, 3, 5}, no, T},
    {34, "Se", "Selenium", 78.971, 1.20, 2.55, {-2, 4, 6}, no, no},
    {35, "Br", "Bromine", 79.904, 1.20, 2.96, {-1, 1, 3, 5}, no, no},
    {36, "Kr", "Krypton", 83.798, 1.16, 3.00, {}, no, no},
    {37, "Rb", "Rubidium", 85.4678, 2.20, 0.82, {1}, no, no},
    {38, "Sr", "Strontium", 87.62, 1.95, 0.95, {2}, no, no},
    {39, "Y", "Yttrium", 88.905838, 1.90, 1.22, {3}, no, no},
    {40, "Zr", "Zirconium", 91.224, 1.75, 1.33, {4}, no, no},
    {41, "Nb", "Niobium", 92.90637, 1.64, 1.6, {3, 5}, no, no},
    {42, "Mo", "Molybdenum", 95.95, 1.54, 2.16, {4, 6}, no, no},
    {43, "Tc", "Technetium", 97, 1.47, 1.9, {4, 7}, R, no},
    {44, "Ru", "Ruthenium", 101.07, 1.46, 2.2, {3, 4}, no, no},
    {45, "Rh", "Rhodium", 102.90549, 1.42, 2.28, {3}, no, no},
    {46, "Pd", "Palladium", 106.42, 1.39, 2.20, {2, 4}, no, no},
    {47, "Ag", "Silver", 107.8682, 1.45, 1.93, {1}, no, no},
    {48, "Cd", "Cadmium", 112.414, 1.44, 1.69, {2}, no, T},
    {49, "In", "Indium", 114.818, 1.42, 1.78, {1, 3}, no, no},
    {50, "Sn", "Tin", 118.710, 1.39, 1.96, {-4, 2, 4}, no, no},
    {51, "Sb", "Antimony", 121.760, 1.39, 2.05, {-3, 3, 5}, no, no},
    {52, "Te", "Tellurium", 127.60, 1.38, 2.1, {-2, 4, 6}, no, no},
    {53, "I", "Iodine", 126.90447, 1.39, 2.66, {-1, 1, 5, 7}, no, no},
    {54, "Xe", "Xenon", 131.293, 1.40, 2.6, {}, no, no},
    {55, "Cs", "Caesium", 132.90545196, 2.44, 0.79, {1}, no, no},
    {56, "Ba", "Barium", 137.327, 2.15, 0.89, {2}, no, no},
    {57, "La", "Lanthanum", 138.90547, 2.07, 1.10, {3}, no, no},
    {58, "Ce", "Cerium", 140.116, 2.04, 1.12, {3, 4}, no, no},
    {59, "Pr", "Praseodymium", 140.90766, 2.03, 1.13, {3}, no, no},
    {60, "Nd", "Neodymium", 144.242, 2.01, 1.14, {3}, no, no},
    {61, "Pm", "Promethium", 145, 1.99, 1.13, {3}, R, no},
    {62, "Sm", "Samarium", 150.36, 1.98, 1.17, {2, 3}, no, no},
    {63, "Eu", "Europium", 151.964, 1.98, 1.2, {2, 3}, no, no},
    {64, "Gd", "Gadolinium", 157.25, 1.96, 1.20, {3}, no, no},
    {65, "Tb", "Terbium", 158.925354, 1.94, 1.1, {3, 4}, no, no},
    {66, "Dy", "Dysprosium", 162.500, 1.92, 1.22, {3}, no, no},
    {67, "Ho", "Holmium", 164.930329, 1.92, 1.23, {3}, no, no},
    {68, "Er", "Erbium", 167.259, 1.89, 1.24, {3}, no, no},
    {69, "Tm", "Thulium", 168.934219, 1.90, 1.25, {3}, no, no},
    {70, "Yb", "Ytterbium", 173.045, 1.87, 1.1, {2, 3}, no, no},
    {71, "Lu", "Lutetium", 174.9668, 1.87, 1.27, {3}, no, no},
    {72, "Hf", "Hafnium", 178.486, 1.75, 1.3, {4}, no, no},
    {73, "Ta", "Tantalum", 180.94788, 1.70, 1.5, {5}, no, no},
    {74, "W", "Tungsten", 183.84, 1.62, 2.36, {4, 6}, no, no},
    {75, "Re", "Rhenium", 186.207, 1.51, 1.9, {4, 6, 7}, no, no},
    {76, "Os", "Osmium", 190.23, 1.44, 2.2, {4, 8}, no, no},
    {77, "Ir", "Iridium", 192.217, 1.41, 2.20, {3, 4}, no, no},
    {78, "Pt", "Platinum", 195.084, 1.36, 2.28, {2, 4}, no, no},
    {79, "Au", "Gold", 196.966570, 1.36, 2.54, {1, 3}, no, no},
    {80, "Hg", "Mercury", 200.592, 1.32, 2.00, {1, 2}, no, T},
    {81, "Tl", "Thallium", 204.38, 1.45, 1.62, {1, 3}, no, T},
    {82, "Pb", "Lead", 207.2, 1.46, 2.33, {2, 4}, no, T},
    {83, "Bi", "Bismuth", 208.98040, 1.48, 2.02, {3, 5}, no, no},
    {84, "Po", "Polonium", 209, 1.40, 2.0, {2, 4}, R, no},
    {85, "At", "Astatine", 210, 1.50, 2.2, {-1, 1}, R, no},
    {86, "Rn", "Radon", 222, 1.50, kNone, {}, R, no},
    {87, "Fr", "Francium", 223, 2.60, 0.7, {1}, R, no},
    {88, "Ra", "Radium", 226, 2.21, 0.9, {2}, R, no},
    {89, "Ac", "Actinium", 227, 2.15, 1.1, {3}, R, no},
    {90, "Th", "Thorium", 232.0377, 2.06, 1.3, {4}, R, no},
    {91, "Pa", "Protactinium", 231.03588, 2.00, 1.5, {4, 5}, R, no},
    {92, "U", "Uranium", 238.02891, 1.96, 1.38, {3, 4, 5, 6}, R, no},
    {93, "Np", "Neptunium", 237, 1.90, 1.36, {3, 4, 5, 6}, R, no},
    {94, "Pu", "Plutonium", 244, 1.87, 1.28, {3, 4, 5, 6}, R, no},
    {95, "Am", "Americium", 243, 1.80, 1.3, {3}, R, no},
    {96, "Cm", "Curium", 247, 1.69, 1.3, {3}, R, no},
    {97, "Bk", "Berkelium", 247, kNone, 1.3, {3, 4}, R, no},
    {98, "Cf", "Californium", 251, kNone, 1.3, {3}, R, no},
    {99, "Es", "Einsteinium", 252, kNone, 1.3, {3}, R, no},
    {100, "Fm", "Fermium", 257, kNone, 1.3, {2, 3}, R, no},
    {101, "Md", "Mendelevium", 258, kNone, 1.3, {2, 3}, R, no},
    {102, "No", "Nobelium", 259, kNone, 1.3, {2, 3}, R, no},
    {103, "Lr", "Lawrencium", 266, kNone, kNone, {3}, R, no},
    {104, "Rf", "Rutherfordium", 267, kNone, kNone, {}, R, no},
    {105, "Db", "Dubnium", 268, kNone, kNone, {}, R, no},
    {106, "Sg", "Seaborgium", 269, kNone, kNone, {}, R, no},
    {107, "Bh", "Bohrium", 270, kNone, kNone, {}, R, no},
    {108, "Hs", "Hassium", 269, kNone, kNone, {}, R, no},
    {109, "Mt", "Meitnerium", 278, kNone, kNone, {}, R, no},
    {110, "Ds", "Darmstadtium", 281, kNone, kNone, {}, R, no},
    {111, "Rg", "Roentgenium", 282, kNone, kNone, {}, R, no},
    {112, "Cn", "Copernicium", 285, kNone, kNone, {}, R, no},
    {113, "Nh", "Nihonium", 286, kNone, kNone, {}, R, no},
    {114, "Fl", "Flerovium", 289, kNone, kNone, {}, R, no},
    {115, "Mc", "Moscovium", 290, kNone, kNone, {}, R, no},
    {116, "Lv", "Livermorium", 293, kNone, kNone, {}, R, no},
    {117, "Ts", "Tennessine", 294, kNone, kNone, {}, R, no},
    {118, "Og", "Oganesson", 294, kNone, kNone, {}, R, no},
};

}  // namespace

const Element* FindElement(int number) {
  if (number < 1 || number > kMaxAtomicNumber) return nullptr;
  return &kTable[number - 1];
}

int AtomicNumber(std::string_view symbol) {
  // 118 string comparisons: cheaper than building a map, and keeps the table free of globals
  // that need initialising.
  for (const Element& e : kTable) {
    if (symbol == e.symbol) return e.number;
  }
  return 0;
}

std::string Describe(int number) {
  const Element* element = FindElement(number);
  if (element == nullptr) return "atomic number " + std::to_string(number) + " (no element)";
  return std::string(element->symbol) + " (element " + std::to_string(number) + ")";
}

}  // namespace nucleate::elements
