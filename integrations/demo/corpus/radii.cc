// Radii that size the corpus cells.
//
// Ionic radii: R. D. Shannon, "Revised effective ionic radii and systematic studies of interatomic
//   distances in halides and chalcogenides", Acta Cryst. A32 (1976) 751-767, Table 1, column "IR"
//   (effective ionic radius, based on r(O2-, VI) = 1.40 angstrom). Every value below was typed
//   FROM MEMORY. tests/reference/demo/corpus_radii_reference.py compares each entry with the copy
//   of the same table that Debian's python3-pymatgen ships (Species.get_shannon_radius) and fails
//   on a difference above 0.005 angstrom. Only the ions the structure types use are listed.
//   Anions are taken at six-fold coordination everywhere, the one coordination Shannon lists for
//   S2-, Se2-, Te2-, Cl-, Br- and I-, except N3-, which the table has only at four-fold.
//
// Metallic radii: the radii for 12-fold coordination printed in the group chapters of N. N.
//   Greenwood and A. Earnshaw, "Chemistry of the Elements", 2nd ed. (1997). Typed FROM MEMORY; the
//   reference test compares them with pymatgen's Element.metallic_radius, a separate compilation,
//   within 0.05 angstrom (a plausibility check, not a check of the source). Radii for 12-fold
//   coordination are used for every intermetallic site, whatever its coordination: Goldschmidt's
//   correction to 8-fold coordination (about -3 %) is left out, so bcc cells come out a few percent
//   large; the strains added later are of the same size.
#include "integrations/demo/corpus/radii.h"

#include <string>

#include "core/common/error.h"
#include "core/elements/elements.h"

namespace nucleate::demo::corpus {
namespace {

constexpr const char* HS = "High Spin";
constexpr const char* LS = "Low Spin";

// symbol, charge, coordination, spin, radius (angstrom). Shannon (1976), from memory.
const std::vector<IonicRadius> kIonic = {
    // Anions.
    {"O", -2, 6, "", 1.40},
    {"S", -2, 6, "", 1.84},
    {"Se", -2, 6, "", 1.98},
    {"Te", -2, 6, "", 2.21},
    {"F", -1, 6, "", 1.33},
    {"Cl", -1, 6, "", 1.81},
    {"Br", -1, 6, "", 1.96},
    {"I", -1, 6, "", 2.20},
    {"N", -3, 4, "", 1.46},
    // Monovalent cations.
    {"Li", 1, 4, "", 0.59},
    {"Li", 1, 6, "", 0.76},
    {"Na", 1, 4, "", 0.99},
    {"Na", 1, 6, "", 1.02},
    {"Na", 1, 8, "", 1.18},
    {"Na", 1, 12, "", 1.39},
    {"K", 1, 4, "", 1.37},
    {"K", 1, 6, "", 1.38},
    {"K", 1, 8, "", 1.51},
    {"K", 1, 12, "", 1.64},
    {"Rb", 1, 6, "", 1.52},
    {"Rb", 1, 8, "", 1.61},
    {"Rb", 1, 12, "", 1.72},
    {"Cs", 1, 6, "", 1.67},
    {"Cs", 1, 8, "", 1.74},
    {"Cs", 1, 12, "", 1.88},
    {"Tl", 1, 8, "", 1.59},
    {"Tl", 1, 12, "", 1.70},
    {"Cu", 1, 2, "", 0.46},
    {"Cu", 1, 4, "", 0.60},
    {"Ag", 1, 2, "", 0.67},
    {"Ag", 1, 4, "", 1.00},
    {"Ag", 1, 6, "", 1.15},
    // Divalent cations.
    {"Be", 2, 4, "", 0.27},
    {"Mg", 2, 4, "", 0.57},
    {"Mg", 2, 6, "", 0.72},
    {"Ca", 2, 6, "", 1.00},
    {"Ca", 2, 8, "", 1.12},
    {"Ca", 2, 12, "", 1.34},
    {"Sr", 2, 6, "", 1.18},
    {"Sr", 2, 8, "", 1.26},
    {"Sr", 2, 12, "", 1.44},
    {"Ba", 2, 6, "", 1.35},
    {"Ba", 2, 8, "", 1.42},
    {"Ba", 2, 12, "", 1.61},
    {"Eu", 2, 6, "", 1.17},
    {"Eu", 2, 8, "", 1.25},
    {"Pb", 2, 6, "", 1.19},
    {"Pb", 2, 8, "", 1.29},
    {"Pb", 2, 12, "", 1.49},
    {"Zn", 2, 4, "", 0.60},
    {"Zn", 2, 6, "", 0.74},
    {"Cd", 2, 4, "", 0.78},
    {"Cd", 2, 6, "", 0.95},
    {"Cd", 2, 8, "", 1.10},
    {"Hg", 2, 4, "", 0.96},
    {"Ti", 2, 6, "", 0.86},
    {"V", 2, 6, "", 0.79},
    {"Cr", 2, 6, HS, 0.80},
    {"Mn", 2, 4, HS, 0.66},
    {"Mn", 2, 6, HS, 0.83},
    {"Fe", 2, 4, HS, 0.63},
    {"Fe", 2, 6, HS, 0.78},
    {"Co", 2, 4, HS, 0.58},
    {"Co", 2, 6, HS, 0.745},
    {"Ni", 2, 4, "", 0.55},
    {"Ni", 2, 6, "", 0.69},
    {"Cu", 2, 4, "", 0.57},
    {"Cu", 2, 6, "", 0.73},
    {"Pd", 2, 6, "", 0.86},
    // Trivalent cations.
    {"Al", 3, 4, "", 0.39},
    {"Al", 3, 6, "", 0.535},
    {"Ga", 3, 4, "", 0.47},
    {"Ga", 3, 6, "", 0.62},
    {"In", 3, 4, "", 0.62},
    {"In", 3, 6, "", 0.80},
    {"Sc", 3, 6, "", 0.745},
    {"Y", 3, 6, "", 0.90},
    {"Y", 3, 8, "", 1.019},
    {"La", 3, 6, "", 1.032},
    {"La", 3, 8, "", 1.16},
    {"La", 3, 12, "", 1.36},
    {"Ce", 3, 12, "", 1.34},
    {"Pr", 3, 8, "", 1.126},
    {"Nd", 3, 8, "", 1.109},
    {"Nd", 3, 12, "", 1.27},
    {"Sm", 3, 8, "", 1.079},
    {"Sm", 3, 12, "", 1.24},
    {"Eu", 3, 8, "", 1.066},
    {"Gd", 3, 6, "", 0.938},
    {"Gd", 3, 8, "", 1.053},
    {"Tb", 3, 8, "", 1.04},
    {"Dy", 3, 8, "", 1.027},
    {"Ho", 3, 8, "", 1.015},
    {"Er", 3, 8, "", 1.004},
    {"Yb", 3, 6, "", 0.868},
    {"Yb", 3, 8, "", 0.985},
    {"Lu", 3, 6, "", 0.861},
    {"Lu", 3, 8, "", 0.977},
    {"Bi", 3, 8, "", 1.17},
    {"Ti", 3, 6, "", 0.67},
    {"V", 3, 6, "", 0.64},
    {"Cr", 3, 6, "", 0.615},
    {"Mn", 3, 6, HS, 0.645},
    {"Fe", 3, 6, HS, 0.645},
    {"Co", 3, 6, LS, 0.545},
    {"Ni", 3, 6, LS, 0.56},
    {"Rh", 3, 6, "", 0.665},
    // Tetravalent cations.
    {"Si", 4, 4, "", 0.26},
    {"Ge", 4, 4, "", 0.39},
    {"Ge", 4, 6, "", 0.53},
    {"Ti", 4, 4, "", 0.42},
    {"Ti", 4, 6, "", 0.605},
    {"Zr", 4, 6, "", 0.72},
    {"Zr", 4, 7, "", 0.78},
    {"Zr", 4, 8, "", 0.84},
    {"Hf", 4, 6, "", 0.71},
    {"Hf", 4, 7, "", 0.76},
    {"Hf", 4, 8, "", 0.83},
    {"Ce", 4, 8, "", 0.97},
    {"Sn", 4, 6, "", 0.69},
    {"Pb", 4, 6, "", 0.775},
    {"V", 4, 6, "", 0.58},
    {"Mn", 4, 6, "", 0.53},
    {"Mo", 4, 6, "", 0.65},
    {"W", 4, 6, "", 0.66},
    {"Ru", 4, 6, "", 0.62},
    {"Os", 4, 6, "", 0.63},
    {"Ir", 4, 6, "", 0.625},
    {"Pt", 4, 6, "", 0.625},
    {"Pd", 4, 6, "", 0.615},
    // Pentavalent and hexavalent cations.
    {"P", 5, 4, "", 0.17},
    {"V", 5, 6, "", 0.54},
    {"Nb", 5, 6, "", 0.64},
    {"Ta", 5, 6, "", 0.64},
    {"Sb", 5, 6, "", 0.60},
    {"Mo", 6, 6, "", 0.59},
    {"W", 6, 6, "", 0.60},
    {"Re", 6, 6, "", 0.55},
    {"Te", 6, 6, "", 0.56},
};

// symbol, radius (angstrom) for 12-fold coordination. Greenwood & Earnshaw (1997), from memory.
const std::vector<MetallicRadius> kMetallic = {
    {"Li", 1.52}, {"Na", 1.86}, {"K", 2.27},  {"Rb", 2.48}, {"Cs", 2.65}, {"Be", 1.12},
    {"Mg", 1.60}, {"Ca", 1.97}, {"Sr", 2.15}, {"Ba", 2.22}, {"Sc", 1.64}, {"Y", 1.80},
    {"La", 1.87}, {"Ce", 1.83}, {"Pr", 1.82}, {"Nd", 1.82}, {"Sm", 1.80}, {"Gd", 1.80},
    {"Ti", 1.47}, {"Zr", 1.60}, {"Hf", 1.59}, {"V", 1.35},  {"Nb", 1.47}, {"Ta", 1.47},
    {"Cr", 1.29}, {"Mo", 1.40}, {"W", 1.41},  {"Mn", 1.27}, {"Re", 1.37}, {"Fe", 1.26},
    {"Ru", 1.34}, {"Os", 1.35}, {"Co", 1.25}, {"Rh", 1.34}, {"Ir", 1.36}, {"Ni", 1.25},
    {"Pd", 1.37}, {"Pt", 1.39}, {"Cu", 1.28}, {"Ag", 1.44}, {"Au", 1.44}, {"Zn", 1.37},
    {"Cd", 1.52}, {"Al", 1.43}, {"Ga", 1.35}, {"In", 1.67}, {"Pb", 1.75},
};

std::string Symbol(int number) {
  const elements::Element* e = elements::FindElement(number);
  return e == nullptr ? "Z=" + std::to_string(number) : e->symbol;
}

}  // namespace

const std::vector<IonicRadius>& IonicRadii() { return kIonic; }
const std::vector<MetallicRadius>& MetallicRadii() { return kMetallic; }

double IonicRadiusOf(int number, int charge, int coordination) {
  const std::string symbol = Symbol(number);
  for (const IonicRadius& r : kIonic) {
    if (symbol == r.symbol && r.charge == charge && r.coordination == coordination) return r.radius;
  }
  throw Internal("no Shannon radius typed in for " + symbol + (charge > 0 ? "+" : "") +
                 std::to_string(charge) + " in " + std::to_string(coordination) +
                 "-fold coordination (integrations/demo/corpus/radii.cc)");
}

double MetallicRadiusOf(int number) {
  const std::string symbol = Symbol(number);
  for (const MetallicRadius& r : kMetallic) {
    if (symbol == r.symbol) return r.radius;
  }
  throw Internal("no metallic radius typed in for " + symbol +
                 " (integrations/demo/corpus/radii.cc)");
}

}  // namespace nucleate::demo::corpus
