#include "core/structure/io/cif_writer.h"

#include "core/structure/composition.h"

#include <algorithm>
#include <cctype>
#include <cmath>
#include <map>
#include <set>

#include "core/common/error.h"
#include "core/elements/elements.h"
#include "core/structure/lattice.h"
#include "core/structure/io/text_number.h"

namespace nucleate::structure::io {

namespace {

constexpr int kCellDecimals = 6;
constexpr int kFracDecimals = 8;

bool IsSpace(char c) { return c == ' ' || c == '\t' || c == '\n' || c == '\r'; }

// A CIF 1.1 value: bare when it can be (no whitespace, no leading character with a meaning of its
// own, not a null or reserved word), else single- or double-quoted (a quote closes only when
// followed by whitespace, so a quote inside is fine unless whitespace follows it), else a text
// field.
std::string CifValueText(const std::string& s) {
  bool bare = !s.empty() && s != "?" && s != "." &&
              std::string("_#$'\"[];").find(s.front()) == std::string::npos;
  for (char c : s) bare = bare && !IsSpace(c);
  std::string lower = s;
  for (char& c : lower) c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  if (lower.rfind("data_", 0) == 0 || lower.rfind("save_", 0) == 0 || lower == "loop_" ||
      lower == "stop_" || lower == "global_") {
    bare = false;
  }
  if (bare) return s;
  const bool has_newline = s.find('\n') != std::string::npos || s.find('\r') != std::string::npos;
  for (char quote : {'\'', '"'}) {
    bool ok = !has_newline;
    for (std::size_t i = 0; ok && i + 1 < s.size(); ++i) {
      ok = !(s[i] == quote && IsSpace(s[i + 1]));
    }
    if (ok && !s.empty() && s.back() == quote) ok = false;
    if (ok) return quote + s + quote;
  }
  return "\n;" + s + "\n;\n";
}

// Block codes are non-blank printable characters (CIF 1.1: at most 75 of them).
std::string BlockName(const std::string& label) {
  std::string name;
  for (char c : label) {
    const unsigned char u = static_cast<unsigned char>(c);
    name.push_back(u > 0x20 && u < 0x7f ? c : '_');
  }
  if (name.empty()) name = "nucleate";
  if (name.size() > 75) name.resize(75);
  return name;
}

void CheckLattice(const Eigen::Matrix3d& lattice) {
  if (!lattice.allFinite()) throw InvalidArgument("lattice", "is not finite");
  if (!(SignedVolume(lattice) > 0)) {
    throw InvalidArgument("lattice", "must have a positive volume (right-handed rows a, b, c)");
  }
}

const char* SymbolOf(int number, const std::string& field) {
  const elements::Element* e = elements::FindElement(number);
  if (!e) throw InvalidArgument(field, "atomic number " + std::to_string(number) + " is not 1..118");
  return e->symbol;
}

// A fractional coordinate with 8 decimals, wrapped after rounding so 0.999999999 is 0, not 1.
std::string FracText(double x, const std::string& field) {
  if (!std::isfinite(x)) throw InvalidArgument(field, "is not finite");
  double w = WrapFraction(x);
  if (std::round(w * 1e8) >= 1e8) w = 0;
  return FormatFixed(w, kFracDecimals);
}

void CellSection(std::string& out, const Eigen::Matrix3d& lattice) {
  const LatticeParameters p = ParametersFromMatrix(lattice);
  out += "_cell_length_a    " + FormatFixed(p.a, kCellDecimals) + "\n";
  out += "_cell_length_b    " + FormatFixed(p.b, kCellDecimals) + "\n";
  out += "_cell_length_c    " + FormatFixed(p.c, kCellDecimals) + "\n";
  out += "_cell_angle_alpha " + FormatFixed(p.alpha, kCellDecimals) + "\n";
  out += "_cell_angle_beta  " + FormatFixed(p.beta, kCellDecimals) + "\n";
  out += "_cell_angle_gamma " + FormatFixed(p.gamma, kCellDecimals) + "\n";
  out += "_cell_volume      " + FormatFixed(SignedVolume(lattice), kCellDecimals) + "\n";
}

void Header(std::string& out, const std::string& label, int number, const std::string& hm) {
  out += "# Written by nucleate\n";
  out += "data_" + BlockName(label) + "\n";
  out += "_symmetry_space_group_name_H-M   " + CifValueText(hm) + "\n";
  out += "_space_group_IT_number           " + std::to_string(number) + "\n";
  // The older name too: some readers still look only for it.
  out += "_symmetry_Int_Tables_number      " + std::to_string(number) + "\n";
}

void OperationsLoop(std::string& out, const std::vector<SymmetryOperation>& ops) {
  out += "loop_\n _symmetry_equiv_pos_site_id\n _symmetry_equiv_pos_as_xyz\n";
  for (std::size_t i = 0; i < ops.size(); ++i) {
    out += "  " + std::to_string(i + 1) + "  '" + FormatSymmetryOperation(ops[i]) + "'\n";
  }
}

void SiteLoopHeader(std::string& out, bool wyckoff) {
  out += "loop_\n _atom_site_type_symbol\n _atom_site_label\n _atom_site_symmetry_multiplicity\n";
  if (wyckoff) out += " _atom_site_Wyckoff_symbol\n";
  out += " _atom_site_fract_x\n _atom_site_fract_y\n _atom_site_fract_z\n _atom_site_occupancy\n";
}

}  // namespace


std::string WriteCifP1(const Crystal& crystal) {
  // CIF holds only lengths and angles, which always describe a right-handed cell. A left-handed
  // lattice L is written as -L with coordinates -f: the same atoms (f L = (-f)(-L)), where writing
  // L's parameters with f would give the mirror image.
  const double handedness = SignedVolume(crystal.lattice) < 0 ? -1.0 : 1.0;
  const Eigen::Matrix3d lattice = handedness * crystal.lattice;
  CheckLattice(lattice);
  if (crystal.frac.size() != crystal.numbers.size()) {
    throw InvalidArgument("frac", "has " + std::to_string(crystal.frac.size()) + " entries for " +
                                      std::to_string(crystal.numbers.size()) + " atomic numbers");
  }
  std::map<int, long long> counts;
  std::string rows;
  std::map<int, int> running;
  for (std::size_t i = 0; i < crystal.size(); ++i) {
    const std::string index = "[" + std::to_string(i) + "]";
    const char* symbol = SymbolOf(crystal.numbers[i], "numbers" + index);
    ++counts[crystal.numbers[i]];
    rows += "  " + std::string(symbol) + "  " + symbol + std::to_string(++running[crystal.numbers[i]]) +
            "  1";
    for (int k = 0; k < 3; ++k) {
      rows += "  " + FracText(handedness * crystal.frac[i][k], "frac" + index);
    }
    rows += "  1\n";
  }
  std::string out;
  Header(out, crystal.label, 1, "P 1");
  CellSection(out, lattice);
  out += "_cell_formula_units_Z  1\n";
  out += "_chemical_formula_sum  " + CifValueText(HillFormula(counts, " ")) + "\n";
  OperationsLoop(out, {SymmetryOperation{}});
  SiteLoopHeader(out, false);
  out += rows;
  return out;
}

std::string WriteCifSymmetrized(const SymmetrizedCrystal& crystal) {
  CheckLattice(crystal.lattice);
  if (crystal.space_group_number < 1 || crystal.space_group_number > 230) {
    throw InvalidArgument("space_group_number", "must be 1..230");
  }
  if (crystal.hm_symbol.empty()) throw InvalidArgument("hm_symbol", "is empty");
  if (crystal.operations.empty()) throw InvalidArgument("operations", "is empty");
  bool identity = false;
  for (std::size_t i = 0; i < crystal.operations.size(); ++i) {
    const SymmetryOperation& op = crystal.operations[i];
    const int det = op.rotation.determinant();
    if ((det != 1 && det != -1) || !op.translation.allFinite()) {
      throw InvalidArgument("operations[" + std::to_string(i) + "]",
                            "is not a crystallographic operation");
    }
    identity = identity || (op.rotation == Eigen::Matrix3i::Identity() &&
                            WrapFractional(op.translation).isZero(1e-9));
  }
  if (!identity) throw InvalidArgument("operations", "must include the identity x, y, z");
  if (crystal.sites.empty()) throw InvalidArgument("sites", "is empty");
  std::map<int, long long> counts;
  std::set<std::string> labels;
  std::string rows;
  for (std::size_t i = 0; i < crystal.sites.size(); ++i) {
    const SymmetrizedSite& site = crystal.sites[i];
    const std::string field = "sites[" + std::to_string(i) + "]";
    const char* symbol = SymbolOf(site.number, field + ".number");
    const auto no_space = [](const std::string& s) {
      return !s.empty() && std::none_of(s.begin(), s.end(), [](char c) {
        return static_cast<unsigned char>(c) <= 0x20 || static_cast<unsigned char>(c) >= 0x7f;
      });
    };
    if (!no_space(site.label) || CifValueText(site.label) != site.label) {
      throw InvalidArgument(field + ".label", "must be a non-empty word usable bare in CIF");
    }
    if (!labels.insert(site.label).second) {
      throw InvalidArgument(field + ".label", "'" + site.label + "' is used twice");
    }
    if (!no_space(site.wyckoff)) throw InvalidArgument(field + ".wyckoff", "must be a letter");
    if (site.multiplicity < 1 ||
        site.multiplicity > static_cast<int>(crystal.operations.size())) {
      throw InvalidArgument(field + ".multiplicity",
                            "must be between 1 and the number of operations");
    }
    counts[site.number] += site.multiplicity;
    rows += "  " + std::string(symbol) + "  " + site.label + "  " +
            std::to_string(site.multiplicity) + "  " + site.wyckoff;
    for (int k = 0; k < 3; ++k) rows += "  " + FracText(site.frac[k], field + ".frac");
    rows += "  1\n";
  }
  std::string out;
  Header(out, crystal.label, crystal.space_group_number, crystal.hm_symbol);
  CellSection(out, crystal.lattice);
  out += "_cell_formula_units_Z  1\n";
  out += "_chemical_formula_sum  " + CifValueText(HillFormula(counts, " ")) + "\n";
  OperationsLoop(out, crystal.operations);
  SiteLoopHeader(out, true);
  out += rows;
  return out;
}

}  // namespace nucleate::structure::io
