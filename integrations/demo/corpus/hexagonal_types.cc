// Hexagonal and trigonal structure types. Wyckoff positions: International Tables for
// Crystallography, Vol. A (trigonal R groups on hexagonal axes). Free coordinates and axial
// ratios are typical values for the prototype compound, from memory, as each parameters_note
// says. Which ions go on which site: ordinary crystal chemistry, common practice, no source.
#include <algorithm>
#include <cmath>

#include "integrations/demo/corpus/structure_type.h"
#include "integrations/demo/corpus/type_helpers.h"

namespace nucleate::demo::corpus {

std::vector<StructureType> HexagonalStructureTypes() {
  std::vector<StructureType> types;
  const double third = 1.0 / 3, two_thirds = 2.0 / 3;

  StructureType wurtzite;
  wurtzite.name = "wurtzite";
  wurtzite.prototype = "ZnO";
  wurtzite.group = &GroupNumber(186);
  wurtzite.shape = Hexagonal(1.602);
  wurtzite.roles = {"A", "X"};
  wurtzite.sites = {{0, "2b", {third, two_thirds, 0}}, {1, "2b", {third, two_thirds, 0.382}}};
  wurtzite.recipes = {
      Ionic({{2, 4, {"Zn", "Cd", "Be", "Mn", "Mg"}}, {-2, 6, {"O", "S", "Se", "Te"}}}),
      Ionic({{3, 4, {"Al", "Ga", "In"}}, {-3, 4, {"N"}}}),
      Ionic({{1, 4, {"Cu", "Ag"}}, {-1, 6, {"Br", "I"}}}),
  };
  wurtzite.parameters_note = "z of X = 0.382, c/a = 1.602: typical for ZnO, from memory";
  types.push_back(wurtzite);

  StructureType hcp;
  hcp.name = "hcp_magnesium";
  hcp.prototype = "Mg";
  hcp.group = &GroupNumber(194);
  hcp.shape = Hexagonal(std::sqrt(8.0 / 3.0));
  hcp.roles = {"A"};
  hcp.sites = {{0, "2c", {third, two_thirds, 0.25}}};
  hcp.recipes = {Metallic({{"Be", "Mg", "Sc", "Ti", "Co", "Zn", "Y", "Zr", "Ru", "Cd", "Hf",
                            "Re", "Os"}})};
  hcp.parameters_note = "c/a = sqrt(8/3), ideal close packing (geometry)";
  types.push_back(hcp);

  StructureType nias;
  nias.name = "nickel_arsenide";
  nias.prototype = "NiAs";
  nias.group = &GroupNumber(194);
  nias.shape = Hexagonal(1.39);
  nias.roles = {"A", "X"};
  nias.sites = {{0, "2a", {0, 0, 0}}, {1, "2c", {third, two_thirds, 0.25}}};
  nias.recipes = {
      Ionic({{2, 6, {"Fe", "Co", "Ni", "Mn", "V", "Ti", "Cr"}}, {-2, 6, {"S", "Se", "Te"}}}),
  };
  nias.parameters_note = "c/a = 1.39: typical for NiAs, from memory";
  types.push_back(nias);

  StructureType alb2;
  alb2.name = "aluminium_diboride";
  alb2.prototype = "AlB2";
  alb2.group = &GroupNumber(191);
  alb2.shape = Hexagonal(1.08);
  alb2.roles = {"A", "B"};
  alb2.sites = {{0, "1a", {0, 0, 0}}, {1, "2d", {third, two_thirds, 0.5}}};
  alb2.recipes = {
      Metallic({{"Mg", "Ca", "Sr", "Ba", "Sc", "Y", "La", "Ti", "Zr", "Hf"},
                {"Al", "Ga", "Zn", "Cd", "In"}}),
  };
  alb2.parameters_note =
      "c/a derived: a from the B-B contact in the honeycomb layer, c from the A-B contact (at "
      "least 2 rA), kept within 0.6..1.6 (1.08 for AlB2 itself)";
  alb2.plausible = [](const RoleRadii& r) { return r[0] / r[1] >= 1.10; };
  alb2.plausibility_note =
      "rA/rB at least 1.10: the A atom between the layers is the larger one in AlB2-type phases, "
      "common practice, no source";
  alb2.derive_geometry = [](const RoleRadii& r, std::vector<Site>&, CellShape& shape) {
    const double a = 2 * std::sqrt(3.0) * r[1];  // B-B = a / sqrt(3)
    const double ab = r[0] + r[1];
    // A-B = sqrt(a^2 / 3 + c^2 / 4); the A-A distance along c is c itself.
    const double c_contact = ab * ab > a * a / 3 ? 2 * std::sqrt(ab * ab - a * a / 3) : 0.0;
    shape.c_over_a = std::clamp(std::max(c_contact, 2 * r[0]) / a, 0.6, 1.6);
  };
  types.push_back(alb2);

  StructureType cacu5;
  cacu5.name = "cacu5";
  cacu5.prototype = "CaCu5";
  cacu5.group = &GroupNumber(191);
  cacu5.shape = Hexagonal(0.80);
  cacu5.roles = {"A", "B"};
  cacu5.sites = {{0, "1a", {0, 0, 0}}, {1, "2c", {third, two_thirds, 0}}, {1, "3g", {0.5, 0, 0.5}}};
  cacu5.recipes = {
      Metallic({{"La", "Ce", "Pr", "Nd", "Sm", "Gd", "Y", "Ca"}, {"Ni", "Co", "Cu", "Pt", "Zn"}}),
  };
  cacu5.parameters_note = "c/a = 0.80: typical for LaNi5, from memory";
  types.push_back(cacu5);

  StructureType cdi2;
  cdi2.name = "cadmium_iodide";
  cdi2.prototype = "CdI2";
  cdi2.group = &GroupNumber(164);
  cdi2.shape = Hexagonal(1.61);
  cdi2.roles = {"A", "X"};
  cdi2.sites = {{0, "1a", {0, 0, 0}}, {1, "2d", {third, two_thirds, 0.25}}};
  cdi2.recipes = {
      Ionic({{4, 6, {"Ti", "Zr", "Hf", "Sn", "Pt", "Pd"}}, {-2, 6, {"S", "Se", "Te"}}}),
      Ionic({{2, 6, {"Mg", "Ca", "Cd", "Fe", "Co", "Ni", "Mn", "Zn", "Pb"}},
             {-1, 6, {"Cl", "Br", "I"}}}),
  };
  cdi2.parameters_note = "z of X = 0.25, c/a = 1.61: typical for CdI2, from memory";
  types.push_back(cdi2);

  StructureType corundum;
  corundum.name = "corundum";
  corundum.prototype = "Al2O3";
  corundum.group = &GroupNumber(167);
  corundum.shape = Hexagonal(2.73);
  corundum.roles = {"A", "X"};
  corundum.sites = {{0, "12c", {0, 0, 0.352}}, {1, "18e", {0.306, 0, 0.25}}};
  corundum.recipes = {
      Ionic({{3, 6, {"Al", "Ga", "Cr", "V", "Ti", "Fe", "Rh", "In", "Mn"}}, {-2, 6, {"O"}}}),
  };
  corundum.parameters_note =
      "z of A (12c) = 0.352, x of O (18e) = 0.306, c/a = 2.73: typical for Al2O3, from memory";
  types.push_back(corundum);

  StructureType ilmenite;
  ilmenite.name = "ilmenite";
  ilmenite.prototype = "FeTiO3";
  ilmenite.group = &GroupNumber(148);
  ilmenite.shape = Hexagonal(2.76);
  ilmenite.roles = {"A", "B", "X"};
  ilmenite.sites = {{0, "6c", {0, 0, 0.355}}, {1, "6c", {0, 0, 0.146}},
                    {2, "18f", {0.317, 0.020, 0.245}}};
  ilmenite.recipes = {
      Ionic({{2, 6, {"Fe", "Mg", "Mn", "Co", "Ni", "Zn", "Cd"}},
             {4, 6, {"Ti", "Ge", "Sn", "Mn"}},
             {-2, 6, {"O"}}}),
      Ionic({{1, 6, {"Li", "Na", "Ag"}}, {5, 6, {"Nb", "Ta", "Sb", "V"}}, {-2, 6, {"O"}}}),
  };
  ilmenite.parameters_note =
      "z of A = 0.355, z of B = 0.146, O (18f) = (0.317, 0.020, 0.245), c/a = 2.76: typical for "
      "FeTiO3, from memory";
  types.push_back(ilmenite);

  StructureType layered;
  layered.name = "layered_rock_salt";
  layered.prototype = "NaFeO2";
  layered.group = &GroupNumber(166);
  layered.shape = Hexagonal(4.99);
  layered.roles = {"A", "B", "X"};
  layered.sites = {{1, "3a", {0, 0, 0}}, {0, "3b", {0, 0, 0.5}}, {2, "6c", {0, 0, 0.26}}};
  layered.recipes = {
      Ionic({{1, 6, {"Li", "Na", "Ag"}},
             {3, 6, {"Co", "Ni", "Cr", "Fe", "V", "Ti", "Sc", "In", "Mn", "Al", "Ga", "Rh"}},
             {-2, 6, {"O", "S"}}}),
  };
  layered.parameters_note = "z of O (6c) = 0.26, c/a = 4.99: typical for LiCoO2, from memory";
  types.push_back(layered);

  StructureType delafossite;
  delafossite.name = "delafossite";
  delafossite.prototype = "CuFeO2";
  delafossite.group = &GroupNumber(166);
  delafossite.shape = Hexagonal(5.66);
  delafossite.roles = {"A", "B", "X"};
  delafossite.sites = {{0, "3a", {0, 0, 0}}, {1, "3b", {0, 0, 0.5}}, {2, "6c", {0, 0, 0.107}}};
  delafossite.recipes = {
      Ionic({{1, 2, {"Cu", "Ag"}},
             {3, 6, {"Al", "Ga", "Fe", "Cr", "Co", "Rh", "In", "Sc", "Y", "La", "Mn"}},
             {-2, 6, {"O"}}}),
  };
  delafossite.parameters_note = "z of O (6c) = 0.107, c/a = 5.66: typical for CuFeO2, from memory";
  types.push_back(delafossite);

  return types;
}

}  // namespace nucleate::demo::corpus
