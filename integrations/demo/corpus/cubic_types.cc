// Cubic structure types. Wyckoff positions: International Tables for Crystallography, Vol. A, in
// the settings of space_groups_used.cc. Free coordinates are typical values for the prototype
// compound, from memory, as each type's parameters_note says. Element lists: the oxidation
// states are common ones of core/elements (Greenwood & Earnshaw); which ions go on which site is
// ordinary crystal chemistry (size and coordination), common practice, no source.
#include <cmath>

#include "integrations/demo/corpus/structure_type.h"
#include "integrations/demo/corpus/type_helpers.h"

namespace nucleate::demo::corpus {

std::vector<StructureType> CubicStructureTypes() {
  std::vector<StructureType> types;

  StructureType rock_salt;
  rock_salt.name = "rock_salt";
  rock_salt.prototype = "NaCl";
  rock_salt.group = &GroupNumber(225);
  rock_salt.roles = {"A", "X"};
  rock_salt.sites = {{0, "4a", {0, 0, 0}}, {1, "4b", {0.5, 0.5, 0.5}}};
  rock_salt.recipes = {
      Ionic({{1, 6, {"Li", "Na", "K", "Rb", "Cs", "Ag"}}, {-1, 6, {"F", "Cl", "Br", "I"}}}),
      Ionic({{2, 6, {"Mg", "Ca", "Sr", "Ba", "Mn", "Fe", "Co", "Ni", "Cd", "Eu", "Pb"}},
             {-2, 6, {"O", "S", "Se", "Te"}}}),
      Ionic({{3, 6, {"Sc", "Y", "La", "Gd", "Ti", "V", "Cr"}}, {-3, 4, {"N"}}}),
  };
  rock_salt.parameters_note = "no free parameters";
  types.push_back(rock_salt);

  StructureType cscl;
  cscl.name = "caesium_chloride";
  cscl.prototype = "CsCl";
  cscl.group = &GroupNumber(221);
  cscl.roles = {"A", "X"};
  cscl.sites = {{0, "1a", {0, 0, 0}}, {1, "1b", {0.5, 0.5, 0.5}}};
  cscl.recipes = {
      Ionic({{1, 8, {"Cs", "Rb", "Tl", "K"}}, {-1, 6, {"Cl", "Br", "I"}}}),
      // The B2 intermetallics (NiAl, CuZn, AuCd ...).
      Metallic({{"Ni", "Co", "Fe", "Cu", "Ag", "Au", "Pd", "Ru", "Rh", "Ir"},
                {"Al", "Ga", "In", "Zn", "Mg", "Ti", "Zr", "Sc", "Cd"}}),
  };
  cscl.parameters_note = "no free parameters";
  types.push_back(cscl);

  StructureType zinc_blende;
  zinc_blende.name = "zinc_blende";
  zinc_blende.prototype = "ZnS";
  zinc_blende.group = &GroupNumber(216);
  zinc_blende.roles = {"A", "X"};
  zinc_blende.sites = {{0, "4a", {0, 0, 0}}, {1, "4c", {0.25, 0.25, 0.25}}};
  zinc_blende.recipes = {
      Ionic({{2, 4, {"Zn", "Cd", "Hg", "Be", "Mn", "Mg"}}, {-2, 6, {"S", "Se", "Te"}}}),
      Ionic({{1, 4, {"Cu", "Ag"}}, {-1, 6, {"Cl", "Br", "I"}}}),
      Ionic({{3, 4, {"Al", "Ga", "In"}}, {-3, 4, {"N"}}}),
  };
  zinc_blende.parameters_note = "no free parameters";
  types.push_back(zinc_blende);

  StructureType fluorite;
  fluorite.name = "fluorite";
  fluorite.prototype = "CaF2";
  fluorite.group = &GroupNumber(225);
  fluorite.roles = {"A", "X"};
  fluorite.sites = {{0, "4a", {0, 0, 0}}, {1, "8c", {0.25, 0.25, 0.25}}};
  fluorite.recipes = {
      Ionic({{2, 8, {"Ca", "Sr", "Ba", "Cd", "Pb", "Eu"}}, {-1, 6, {"F", "Cl"}}}),
      Ionic({{4, 8, {"Zr", "Hf", "Ce"}}, {-2, 6, {"O"}}}),
  };
  fluorite.parameters_note = "no free parameters";
  types.push_back(fluorite);

  StructureType anti_fluorite;
  anti_fluorite.name = "anti_fluorite";
  anti_fluorite.prototype = "Li2O";
  anti_fluorite.group = &GroupNumber(225);
  anti_fluorite.roles = {"A", "X"};
  anti_fluorite.sites = {{0, "8c", {0.25, 0.25, 0.25}}, {1, "4a", {0, 0, 0}}};
  anti_fluorite.recipes = {
      Ionic({{1, 4, {"Li", "Na", "K", "Cu", "Ag"}}, {-2, 6, {"O", "S", "Se", "Te"}}}),
  };
  anti_fluorite.parameters_note = "no free parameters";
  types.push_back(anti_fluorite);

  StructureType perovskite;
  perovskite.name = "perovskite";
  perovskite.prototype = "SrTiO3";
  perovskite.group = &GroupNumber(221);
  perovskite.roles = {"A", "B", "X"};
  perovskite.sites = {{1, "1a", {0, 0, 0}}, {0, "1b", {0.5, 0.5, 0.5}}, {2, "3d", {0.5, 0, 0}}};
  perovskite.recipes = {
      Ionic({{1, 12, {"Na", "K", "Rb"}}, {5, 6, {"Nb", "Ta", "Sb", "V"}}, {-2, 6, {"O"}}}),
      Ionic({{2, 12, {"Ca", "Sr", "Ba", "Pb"}},
             {4, 6, {"Ti", "Zr", "Hf", "Sn", "Mn", "Mo", "Ru", "Ir", "V", "Pb", "Ge"}},
             {-2, 6, {"O"}}}),
      Ionic({{3, 12, {"La", "Ce", "Nd", "Sm"}},
             {3, 6, {"Al", "Ga", "Sc", "Cr", "Fe", "Mn", "Co", "Ni", "Ti", "V", "Rh", "In"}},
             {-2, 6, {"O"}}}),
      Ionic({{1, 12, {"K", "Rb", "Cs", "Tl"}},
             {2, 6, {"Mg", "Mn", "Fe", "Co", "Ni", "Cu", "Zn", "Cd", "Ca"}},
             {-1, 6, {"F"}}}),
  };
  perovskite.parameters_note = "no free parameters";
  perovskite.plausible = [](const RoleRadii& r) {
    return InWindow(ToleranceFactor(r[0], r[1], r[2]), 0.90, 1.10);
  };
  perovskite.plausibility_note =
      "Goldschmidt tolerance factor (rA + rX) / (sqrt(2) (rB + rX)) in 0.90..1.10, A at 12-fold "
      "coordination: the usual range of cubic perovskites, common practice, no source";
  types.push_back(perovskite);

  StructureType reo3;
  reo3.name = "rhenium_trioxide";
  reo3.prototype = "ReO3";
  reo3.group = &GroupNumber(221);
  reo3.roles = {"B", "X"};
  reo3.sites = {{0, "1a", {0, 0, 0}}, {1, "3d", {0.5, 0, 0}}};
  reo3.recipes = {
      Ionic({{6, 6, {"W", "Mo", "Re"}}, {-2, 6, {"O"}}}),
      Ionic({{3, 6, {"Sc", "Fe", "Cr", "Ga", "In", "Ti", "V", "Al", "Co"}}, {-1, 6, {"F"}}}),
  };
  reo3.parameters_note = "no free parameters";
  types.push_back(reo3);

  StructureType double_perovskite;
  double_perovskite.name = "double_perovskite";
  double_perovskite.prototype = "Ba2MgWO6";
  double_perovskite.group = &GroupNumber(225);
  double_perovskite.roles = {"A", "B", "C", "X"};
  double_perovskite.sites = {{0, "8c", {0.25, 0.25, 0.25}},
                             {1, "4a", {0, 0, 0}},
                             {2, "4b", {0.5, 0.5, 0.5}},
                             {3, "24e", {0.25, 0, 0}}};
  const std::vector<const char*> large_a2 = {"Ca", "Sr", "Ba", "Pb"};
  double_perovskite.recipes = {
      Ionic({{2, 12, large_a2},
             {2, 6, {"Mg", "Mn", "Fe", "Co", "Ni", "Cu", "Zn", "Cd", "Ca"}},
             {6, 6, {"W", "Mo", "Te", "Re"}},
             {-2, 6, {"O"}}}),
      Ionic({{2, 12, large_a2},
             {3, 6, {"Sc", "Cr", "Fe", "Ga", "In", "Al", "Mn", "Co", "Y", "Yb", "Lu", "Rh"}},
             {5, 6, {"Nb", "Ta", "Sb"}},
             {-2, 6, {"O"}}}),
      Ionic({{3, 12, {"La", "Nd"}},
             {2, 6, {"Mg", "Co", "Ni", "Zn", "Mn", "Cu", "Fe"}},
             {4, 6, {"Ti", "Mn", "Zr", "Sn", "Ru", "Ir"}},
             {-2, 6, {"O"}}}),
  };
  double_perovskite.parameters_note =
      "x of O (24e) set so that both B-O and C-O bonds have their radius sums (derived, not "
      "typed)";
  double_perovskite.plausible = [](const RoleRadii& r) {
    return InWindow(ToleranceFactor(r[0], 0.5 * (r[1] + r[2]), r[3]), 0.90, 1.10);
  };
  double_perovskite.plausibility_note =
      "tolerance factor with the mean B-site radius in 0.90..1.10, as for the cubic perovskite";
  double_perovskite.derive_geometry = [](const RoleRadii& r, std::vector<Site>& sites, CellShape&) {
    const double b_bond = r[1] + r[3], c_bond = r[2] + r[3];
    // B at 0 and C at a/2 along x: O at x*a has bonds x*a and (1/2 - x)*a in the ratio b : c.
    sites[3].point = {b_bond / (2 * (b_bond + c_bond)), 0, 0};
  };
  types.push_back(double_perovskite);

  StructureType spinel;
  spinel.name = "spinel";
  spinel.prototype = "MgAl2O4";
  spinel.group = &GroupNumber(227);
  spinel.roles = {"A", "B", "X"};
  spinel.sites = {{0, "8a", {0, 0, 0}},
                  {1, "16d", {0.625, 0.625, 0.625}},
                  {2, "32e", {0.387, 0.387, 0.387}}};
  spinel.recipes = {
      Ionic({{2, 4, {"Mg", "Zn", "Mn", "Fe", "Co", "Cd", "Cu", "Ni"}},
             {3, 6, {"Al", "Ga", "Cr", "Fe", "Mn", "V", "Co", "Rh", "In", "Ti"}},
             {-2, 6, {"O", "S", "Se"}}}),
      Ionic({{4, 4, {"Si", "Ge", "Ti"}},
             {2, 6, {"Mg", "Fe", "Co", "Ni", "Mn", "Zn"}},
             {-2, 6, {"O"}}}),
  };
  spinel.parameters_note =
      "x of O (32e) set so that the tetrahedral and octahedral bonds are in the ratio of their "
      "radius sums (derived, not typed; 0.387 for MgAl2O4 in origin choice 1)";
  spinel.derive_geometry = [](const RoleRadii& r, std::vector<Site>& sites, CellShape&) {
    const double u = SpinelOxygenParameter((r[0] + r[2]) / (r[1] + r[2]));
    sites[2].point = {u, u, u};
  };
  types.push_back(spinel);

  StructureType pyrochlore;
  pyrochlore.name = "pyrochlore";
  pyrochlore.prototype = "Gd2Ti2O7";
  pyrochlore.group = &GroupNumber(227);
  pyrochlore.roles = {"A", "B", "X"};
  pyrochlore.sites = {{0, "16d", {0.625, 0.625, 0.625}},
                      {1, "16c", {0.125, 0.125, 0.125}},
                      {2, "48f", {0.205, 0, 0}},
                      {2, "8b", {0.5, 0.5, 0.5}}};
  pyrochlore.recipes = {
      Ionic({{3, 8, {"La", "Pr", "Nd", "Sm", "Eu", "Gd", "Tb", "Dy", "Ho", "Er", "Yb", "Lu", "Y", "Bi"}},
             {4, 6, {"Ti", "Zr", "Hf", "Sn", "Mn", "Ru", "Ir", "Ge", "Mo", "Pb"}},
             {-2, 6, {"O"}}}),
      Ionic({{2, 8, {"Ca", "Cd"}}, {5, 6, {"Nb", "Ta", "Sb"}}, {-2, 6, {"O"}}}),
  };
  pyrochlore.parameters_note =
      "x of O (48f) = 0.205 in origin choice 1 (0.330 in origin choice 2): typical for "
      "rare-earth titanates and zirconates, from memory";
  pyrochlore.plausible = [](const RoleRadii& r) { return InWindow(r[0] / r[1], 1.40, 1.85); };
  pyrochlore.plausibility_note =
      "radius ratio rA/rB in 1.40..1.85, around the pyrochlore field of about 1.46..1.78 "
      "(from memory)";
  types.push_back(pyrochlore);

  StructureType pyrite;
  pyrite.name = "pyrite";
  pyrite.prototype = "FeS2";
  pyrite.group = &GroupNumber(205);
  pyrite.roles = {"A", "X"};
  pyrite.sites = {{0, "4a", {0, 0, 0}}, {1, "8c", {0.385, 0.385, 0.385}}};
  // In common oxidation states the disulfide anion S2(2-) is not available, so the metal is
  // tetravalent against X2- (MnS2 and RuS2 satisfy core's charge check this way; FeS2 would not).
  pyrite.recipes = {
      Ionic({{4, 6, {"Mn", "Ru", "Os", "Ir", "Pt", "Pd"}}, {-2, 6, {"S", "Se", "Te"}}}),
  };
  pyrite.parameters_note = "x of X (8c) = 0.385: typical for FeS2, from memory";
  types.push_back(pyrite);

  StructureType a15;
  a15.name = "a15";
  a15.prototype = "Cr3Si";
  a15.group = &GroupNumber(223);
  a15.roles = {"A", "B"};
  a15.sites = {{0, "6c", {0.25, 0, 0.5}}, {1, "2a", {0, 0, 0}}};
  a15.recipes = {
      Metallic({{"Nb", "V", "Ta", "Cr", "Mo", "Ti", "Zr"},
                {"Al", "Ga", "In", "Au", "Pt", "Ir", "Os", "Rh"}}),
  };
  a15.parameters_note = "no free parameters";
  types.push_back(a15);

  StructureType cu3au;
  cu3au.name = "cu3au";
  cu3au.prototype = "Cu3Au";
  cu3au.group = &GroupNumber(221);
  cu3au.roles = {"A", "B"};
  cu3au.sites = {{1, "1a", {0, 0, 0}}, {0, "3c", {0, 0.5, 0.5}}};
  cu3au.recipes = {
      Metallic({{"Cu", "Ni", "Pt", "Pd", "Fe", "Co", "Ir", "Rh", "Al"},
                {"Au", "Al", "Ti", "Mn", "Fe", "Zr", "Hf", "Sc", "Y", "In", "Ga", "Pt"}}),
  };
  cu3au.parameters_note = "no free parameters";
  types.push_back(cu3au);

  StructureType heusler;
  heusler.name = "heusler";
  heusler.prototype = "Cu2MnAl";
  heusler.group = &GroupNumber(225);
  heusler.roles = {"A", "B", "C"};
  heusler.sites = {{0, "8c", {0.25, 0.25, 0.25}}, {1, "4b", {0.5, 0.5, 0.5}}, {2, "4a", {0, 0, 0}}};
  heusler.recipes = {
      Metallic({{"Cu", "Ni", "Co", "Fe", "Pd", "Rh", "Pt", "Ru", "Ir"},
                {"Mn", "Ti", "V", "Zr", "Hf", "Nb", "Cr", "Sc", "Ta"},
                {"Al", "Ga", "In"}}),
  };
  heusler.parameters_note = "no free parameters";
  types.push_back(heusler);

  StructureType quaternary_heusler;
  quaternary_heusler.name = "quaternary_heusler";
  quaternary_heusler.prototype = "LiMgPdSn";
  quaternary_heusler.group = &GroupNumber(216);
  quaternary_heusler.roles = {"A", "B", "C", "D"};
  quaternary_heusler.sites = {{0, "4c", {0.25, 0.25, 0.25}},
                              {1, "4d", {0.75, 0.75, 0.75}},
                              {2, "4b", {0.5, 0.5, 0.5}},
                              {3, "4a", {0, 0, 0}}};
  const std::vector<const char*> late_metals = {"Co", "Fe", "Ni", "Cu", "Pd",
                                                "Rh", "Pt", "Ru", "Ir", "Mn"};
  Recipe quaternary = Metallic({late_metals,
                                late_metals,
                                {"Ti", "V", "Cr", "Mn", "Zr", "Hf", "Nb", "Sc", "Y", "Ta"},
                                {"Al", "Ga", "In"}});
  // An inversion through the origin exchanges 4c and 4d and maps the structure onto a congruent
  // copy: A on 4c with B on 4d is the same crystal as B on 4c with A on 4d.
  quaternary.first_two_interchangeable = true;
  quaternary_heusler.recipes = {quaternary};
  quaternary_heusler.parameters_note = "no free parameters";
  types.push_back(quaternary_heusler);

  StructureType fcc;
  fcc.name = "fcc_copper";
  fcc.prototype = "Cu";
  fcc.group = &GroupNumber(225);
  fcc.roles = {"A"};
  fcc.sites = {{0, "4a", {0, 0, 0}}};
  fcc.recipes = {Metallic({{"Al", "Cu", "Ni", "Ag", "Au", "Pt", "Pd", "Ir", "Rh", "Pb", "Ca", "Sr"}})};
  fcc.parameters_note = "no free parameters";
  types.push_back(fcc);

  StructureType bcc;
  bcc.name = "bcc_tungsten";
  bcc.prototype = "W";
  bcc.group = &GroupNumber(229);
  bcc.roles = {"A"};
  bcc.sites = {{0, "2a", {0, 0, 0}}};
  bcc.recipes = {Metallic({{"Li", "Na", "K", "Rb", "Cs", "Ba", "V", "Cr", "Fe", "Nb", "Mo", "Ta", "W"}})};
  bcc.parameters_note = "no free parameters";
  types.push_back(bcc);

  return types;
}

}  // namespace nucleate::demo::corpus
