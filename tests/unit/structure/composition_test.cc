#include "core/structure/composition.h"

#include <gtest/gtest.h>

#include "core/common/error.h"

namespace nucleate::structure {
namespace {

// Hill system: Hill, J. Am. Chem. Soc. 22, 478 (1900); the ordering CIF's _chemical_formula_sum
// asks for (IUCr CIF core dictionary).
TEST(HillFormula, WithoutCarbonIsAlphabetical) {
  EXPECT_EQ(HillFormula({38, 22, 8, 8, 8}), "O3SrTi");
  EXPECT_EQ(HillFormula({17, 11}), "ClNa");
}

TEST(HillFormula, WithCarbonPutsCarbonThenHydrogenFirst) {
  EXPECT_EQ(HillFormula({1, 1, 6, 1, 1}), "CH4");
  EXPECT_EQ(HillFormula({8, 6, 20, 8, 8}), "CCaO3");
  EXPECT_EQ(HillFormula({1, 8, 1}), "H2O");  // no carbon: H sorts alphabetically
}

TEST(HillFormula, FromCountsWithTheSeparatorCifUses) {
  // CIF core dictionary, _chemical_formula_sum: Hill order, counts of 1 omitted, spaces between.
  EXPECT_EQ(HillFormula(std::map<int, long long>{{6, 2}, {1, 6}, {8, 1}}, " "), "C2 H6 O");
  EXPECT_EQ(HillFormula(std::map<int, long long>{{11, 4}, {17, 4}, {1, 2}}, " "), "Cl4 H2 Na4");
}

TEST(ReducedFormula, DividesByTheGreatestCommonDivisor) {
  EXPECT_EQ(ReducedHillFormula({22, 22, 8, 8, 8, 8}), "O2Ti");
  EXPECT_EQ(ReducedHillFormula({26, 26, 26, 8, 8, 8, 8}), "Fe3O4");
  EXPECT_EQ(ReducedHillFormula({}), "");
}

TEST(CountElements, NamesTheSiteOfAnUnknownNumber) {
  try {
    CountElements({8, 0});
    FAIL() << "no error";
  } catch (const Error& error) {
    EXPECT_EQ(error.field(), "atomic_numbers[1]");
  }
}

}  // namespace
}  // namespace nucleate::structure
