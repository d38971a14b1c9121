// Space groups of textbook structures built from the International Tables' Wyckoff positions.
// Expected numbers and symbols: International Tables for Crystallography Vol. A (each structure's
// source is in textbook_structures.cc).
#include <algorithm>
#include <cctype>
#include <cmath>
#include <ostream>

#include <gtest/gtest.h>

#include "core/symmetry/symmetry.h"
#include "tests/unit/symmetry/test_support.h"
#include "tests/unit/symmetry/textbook_structures.h"

namespace nucleate::symmetry::testing {

// gtest prints a failing parameter with this instead of its raw bytes.
void PrintTo(const Textbook& t, std::ostream* os) { *os << t.name; }

namespace {

class TextbookTest : public ::testing::TestWithParam<Textbook> {};

TEST_P(TextbookTest, SpaceGroupNumberAndSymbol) {
  const Textbook& t = GetParam();
  const SymmetryInfo info = AnalyseSymmetry(t.crystal);
  EXPECT_EQ(info.number, t.number) << t.name << " (" << t.source << ")";
  EXPECT_EQ(info.international, t.symbol) << t.name;
  // Crystal system from the number ranges of ITA Vol. A.
  EXPECT_EQ(info.crystal_system, CrystalSystemOf(t.number)) << t.name;
  EXPECT_EQ(info.wyckoffs.size(), t.crystal.size());
  EXPECT_EQ(info.equivalent_atoms.size(), t.crystal.size());
}

TEST_P(TextbookTest, WyckoffPositionsAreThoseOfTheTables) {
  const Textbook& t = GetParam();
  const SymmetryInfo info = AnalyseSymmetry(t.crystal);
  const std::string found = WyckoffDescription(AsymmetricUnit(t.crystal, info));
  EXPECT_NE(std::find(t.wyckoff_alternatives.begin(), t.wyckoff_alternatives.end(), found),
            t.wyckoff_alternatives.end())
      << t.name << ": spglib describes it as '" << found << "'";
}

TEST_P(TextbookTest, StandardSettingKeepsGroupAndMultiplicities) {
  const Textbook& t = GetParam();
  const StandardSetting s = StandardSettingForCif(t.crystal);
  EXPECT_EQ(s.info.number, t.number) << t.name;
  // Built in the standard conventional cell already, so the symmetrised cell has the same atoms.
  EXPECT_EQ(s.cell.size(), t.crystal.size()) << t.name;
  int total = 0;
  for (const auto& site : s.asymmetric_unit) total += site.multiplicity;
  EXPECT_EQ(total, static_cast<int>(s.cell.size())) << t.name;
  const std::string found = WyckoffDescription(s.asymmetric_unit);
  EXPECT_NE(std::find(t.wyckoff_alternatives.begin(), t.wyckoff_alternatives.end(), found),
            t.wyckoff_alternatives.end())
      << t.name << ": standard setting described as '" << found << "'";
  // The group's operations map the symmetrised cell onto itself (definition of a symmetry
  // operation; common practice, no source).
  for (const auto& op : s.info.operations) {
    for (std::size_t i = 0; i < s.cell.size(); ++i) {
      const Eigen::Vector3d image = op.rotation.cast<double>() * s.cell.frac[i] + op.translation;
      double best = 1e9;
      for (std::size_t j = 0; j < s.cell.size(); ++j) {
        if (s.cell.numbers[j] != s.cell.numbers[i]) continue;
        Eigen::Vector3d d = image - s.cell.frac[j];
        for (int k = 0; k < 3; ++k) d[k] -= std::round(d[k]);
        best = std::min(best, (s.cell.lattice.transpose() * d).norm());
      }
      ASSERT_LT(best, 1e-6) << t.name;
    }
  }
}

TEST_P(TextbookTest, PrimitiveCellHoldsTheCentringFractionOfAtoms) {
  const Textbook& t = GetParam();
  const structure::Crystal primitive = StandardPrimitiveCell(t.crystal);
  const SymmetryInfo info = AnalyseSymmetry(t.crystal);
  // Centring multiplicity from the first letter of the symbol: P 1, I 2, R (hexagonal axes) 3,
  // F 4 (ITA Vol. A, conventional cells; common practice, no source).
  const char lattice_letter = t.symbol[0];
  const int centring = lattice_letter == 'F' ? 4 : lattice_letter == 'R' ? 3
                       : lattice_letter == 'I' ? 2 : 1;
  EXPECT_EQ(primitive.size() * centring, t.crystal.size()) << t.name;
  const double volume = std::abs(t.crystal.lattice.determinant());
  EXPECT_NEAR(std::abs(primitive.lattice.determinant()), volume / centring, 1e-6 * volume);
  EXPECT_NEAR(info.PrimitiveVolume(), volume / centring, 1e-6 * volume);
  EXPECT_EQ(AnalyseSymmetry(primitive).number, t.number) << t.name;
}

std::string TestName(const ::testing::TestParamInfo<Textbook>& info) {
  std::string name = info.param.name;
  for (char& c : name)
    if (!std::isalnum(static_cast<unsigned char>(c))) c = '_';
  return name;
}

INSTANTIATE_TEST_SUITE_P(Tables, TextbookTest, ::testing::ValuesIn(TextbookStructures()),
                         TestName);

// The operation counts in the standard conventional cell, ITA Vol. A (order of the point group
// times the centring multiplicity): Fd-3m 48 x 4, R-3c (hexagonal axes) 12 x 3, P4_2/mnm 16.
TEST(TextbookOperations, OrdersOfTheGroups) {
  for (const auto& t : TextbookStructures()) {
    const StandardSetting s = StandardSettingForCif(t.crystal);
    std::size_t expected = 0;
    if (t.number == 227) expected = 192;
    if (t.number == 167) expected = 36;
    if (t.number == 136) expected = 16;
    if (t.number == 186) expected = 12;
    if (t.number == 14) expected = 4;
    if (t.number == 2) expected = 2;
    if (t.number == 1) expected = 1;
    if (expected != 0) EXPECT_EQ(s.info.operations.size(), expected) << t.name;
  }
}

TEST(TextbookSettings, SpinelHasOriginChoiceTwoSettingAndMultiplicities) {
  for (const auto& t : TextbookStructures()) {
    if (t.name != "MgAl2O4 spinel") continue;
    const StandardSetting s = StandardSettingForCif(t.crystal);
    // Mg 8, Al 16, O 32 per conventional cell (ITA Vol. A No. 227: 8a, 16d, 32e).
    ASSERT_EQ(s.asymmetric_unit.size(), 3u);
    for (const auto& site : s.asymmetric_unit) {
      if (site.number == 12) EXPECT_EQ(site.multiplicity, 8);
      if (site.number == 13) EXPECT_EQ(site.multiplicity, 16);
      if (site.number == 8) EXPECT_EQ(site.multiplicity, 32);
    }
    // spglib's settings table: Hall numbers 525 (origin choice 1) and 526 (origin choice 2) for
    // Fd-3m (spglib documentation, "Space group type"; from memory).
    EXPECT_TRUE(s.info.hall_number == 525 || s.info.hall_number == 526) << s.info.hall_number;
  }
}

}  // namespace
}  // namespace nucleate::symmetry::testing
