// Tetragonal, orthorhombic and monoclinic structure types. Wyckoff positions: International Tables
// for Crystallography, Vol. A (monoclinic: unique axis b, cell choice 1). Free coordinates and
// cell shapes are typical values for the prototype compound, from memory, as each
// parameters_note says. Which ions go on which site: ordinary crystal chemistry, common practice,
// no source.
#include "integrations/demo/corpus/structure_type.h"
#include "integrations/demo/corpus/type_helpers.h"

namespace nucleate::demo::corpus {

std::vector<StructureType> LowerSymmetryStructureTypes() {
  std::vector<StructureType> types;

  StructureType rutile;
  rutile.name = "rutile";
  rutile.prototype = "TiO2";
  rutile.group = &GroupNumber(136);
  rutile.shape = Tetragonal(0.644);
  rutile.roles = {"A", "X"};
  rutile.sites = {{0, "2a", {0, 0, 0}}, {1, "4f", {0.305, 0.305, 0}}};
  rutile.recipes = {
      Ionic({{4, 6, {"Ti", "Sn", "Ge", "Mn", "Ru", "Ir", "Os", "Pb", "V", "Mo", "W"}},
             {-2, 6, {"O"}}}),
      Ionic({{2, 6, {"Mg", "Mn", "Fe", "Co", "Ni", "Zn", "Pd"}}, {-1, 6, {"F"}}}),
  };
  rutile.parameters_note = "x of O (4f) = 0.305, c/a = 0.644: typical for TiO2, from memory";
  types.push_back(rutile);

  StructureType anatase;
  anatase.name = "anatase";
  anatase.prototype = "TiO2";
  anatase.group = &GroupNumber(141);
  anatase.shape = Tetragonal(2.51);
  anatase.roles = {"A", "X"};
  anatase.sites = {{0, "4a", {0, 0, 0}}, {1, "8e", {0, 0, 0.208}}};
  anatase.recipes = {Ionic({{4, 6, {"Ti", "Sn", "Ge", "V", "Mn", "Ru"}}, {-2, 6, {"O"}}})};
  anatase.parameters_note =
      "z of O (8e) = 0.208 (origin choice 1), c/a = 2.51: typical for TiO2, from memory";
  types.push_back(anatase);

  StructureType olivine;
  olivine.name = "olivine";
  olivine.prototype = "Mg2SiO4";
  olivine.group = &GroupNumber(62);
  olivine.shape = Orthorhombic(0.586, 0.467);
  olivine.roles = {"M1", "M2", "T", "X"};
  olivine.sites = {{0, "4a", {0, 0, 0}},
                   {1, "4c", {0.277, 0.25, 0.992}},
                   {2, "4c", {0.094, 0.25, 0.426}},
                   {3, "4c", {0.092, 0.25, 0.766}},
                   {3, "4c", {0.448, 0.25, 0.221}},
                   {3, "8d", {0.163, 0.033, 0.278}}};
  Recipe silicate = Ionic({{2, 6, {"Mg", "Fe", "Mn", "Co", "Ni"}},
                           {2, 6, {"Mg", "Fe", "Mn", "Co", "Ni", "Ca"}},
                           {4, 4, {"Si", "Ge"}},
                           {-2, 6, {"O"}}});
  silicate.roles_may_share = true;  // M1 and M2 hold the same metal in Mg2SiO4 itself
  olivine.recipes = {
      silicate,
      Ionic({{1, 6, {"Li"}}, {2, 6, {"Fe", "Mn", "Co", "Ni", "Mg"}}, {5, 4, {"P"}}, {-2, 6, {"O"}}}),
  };
  olivine.parameters_note =
      "M2 (0.277, 1/4, 0.992), T (0.094, 1/4, 0.426), O1 (0.092, 1/4, 0.766), O2 (0.448, 1/4, "
      "0.221), O3 (0.163, 0.033, 0.278), b/a = 0.586, c/a = 0.467: typical for Mg2SiO4, from "
      "memory";
  types.push_back(olivine);

  StructureType gdfeo3;
  gdfeo3.name = "orthorhombic_perovskite";
  gdfeo3.prototype = "GdFeO3";
  gdfeo3.group = &GroupNumber(62);
  gdfeo3.shape = Orthorhombic(1.367, 0.954);
  gdfeo3.roles = {"A", "B", "X"};
  gdfeo3.sites = {{1, "4b", {0, 0, 0.5}},
                  {0, "4c", {0.060, 0.25, 0.985}},
                  {2, "4c", {0.470, 0.25, 0.090}},
                  {2, "8d", {0.300, 0.050, 0.700}}};
  gdfeo3.recipes = {
      Ionic({{3, 8, {"Y", "La", "Pr", "Nd", "Sm", "Eu", "Gd", "Tb", "Dy", "Ho", "Er", "Yb", "Lu"}},
             {3, 6, {"Fe", "Cr", "Al", "Ga", "Mn", "Sc", "Co", "Ni", "Ti", "V", "Rh", "In"}},
             {-2, 6, {"O"}}}),
      Ionic({{2, 8, {"Ca", "Cd", "Sr"}},
             {4, 6, {"Ti", "Zr", "Sn", "Hf", "Mn", "Ru", "Ir"}},
             {-2, 6, {"O"}}}),
      Ionic({{1, 8, {"Na"}}, {2, 6, {"Mg", "Mn", "Fe", "Co", "Ni", "Zn", "Cu"}}, {-1, 6, {"F"}}}),
  };
  gdfeo3.parameters_note =
      "Pnma: A (0.060, 1/4, 0.985), O1 (0.470, 1/4, 0.090), O2 (0.300, 0.050, 0.700), b/a = "
      "1.367, c/a = 0.954: typical for GdFeO3, from memory";
  gdfeo3.plausible = [](const RoleRadii& r) {
    return InWindow(ToleranceFactor(r[0], r[1], r[2]), 0.75, 0.98);
  };
  gdfeo3.plausibility_note =
      "tolerance factor with A at 8-fold coordination in 0.75..0.98: tilted perovskites, common "
      "practice, no source";
  types.push_back(gdfeo3);

  StructureType baddeleyite;
  baddeleyite.name = "baddeleyite";
  baddeleyite.prototype = "ZrO2";
  baddeleyite.group = &GroupNumber(14);
  baddeleyite.shape = Monoclinic(1.012, 1.031, 99.2);
  baddeleyite.roles = {"A", "X"};
  baddeleyite.sites = {{0, "4e", {0.276, 0.040, 0.209}},
                       {1, "4e", {0.070, 0.332, 0.345}},
                       {1, "4e", {0.450, 0.757, 0.479}}};
  baddeleyite.recipes = {Ionic({{4, 7, {"Zr", "Hf"}}, {-2, 6, {"O"}}})};
  baddeleyite.parameters_note =
      "Zr (0.276, 0.040, 0.209), O1 (0.070, 0.332, 0.345), O2 (0.450, 0.757, 0.479), b/a = "
      "1.012, c/a = 1.031, beta = 99.2: typical for ZrO2, from memory";
  types.push_back(baddeleyite);

  StructureType wolframite;
  wolframite.name = "wolframite";
  wolframite.prototype = "MnWO4";
  wolframite.group = &GroupNumber(13);
  wolframite.shape = Monoclinic(1.193, 1.033, 91.1);
  wolframite.roles = {"A", "B", "X"};
  wolframite.sites = {{0, "2f", {0.5, 0.685, 0.25}},
                      {1, "2e", {0, 0.180, 0.25}},
                      {2, "4g", {0.211, 0.102, 0.942}},
                      {2, "4g", {0.253, 0.375, 0.393}}};
  wolframite.recipes = {
      Ionic({{2, 6, {"Mg", "Mn", "Fe", "Co", "Ni", "Zn", "Cd", "Cu"}},
             {6, 6, {"W", "Mo"}},
             {-2, 6, {"O"}}}),
      Ionic({{3, 6, {"Sc", "In", "Fe", "Cr", "Ga"}}, {5, 6, {"Nb", "Ta"}}, {-2, 6, {"O"}}}),
  };
  wolframite.parameters_note =
      "A (1/2, 0.685, 1/4), W (0, 0.180, 1/4), O1 (0.211, 0.102, 0.942), O2 (0.253, 0.375, "
      "0.393), b/a = 1.193, c/a = 1.033, beta = 91.1: typical for MnWO4, from memory";
  types.push_back(wolframite);

  return types;
}

}  // namespace nucleate::demo::corpus
