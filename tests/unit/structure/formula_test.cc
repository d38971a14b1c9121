// ParseFormula: written formulas read into (atomic number, count), and bad ones refused with the
// field, what was wrong and the character where it was found.
#include <string>
#include <utility>
#include <vector>

#include <gtest/gtest.h>

#include "core/common/error.h"
#include "core/structure/composition.h"

namespace nucleate::structure {
namespace {

using Terms = std::vector<std::pair<int, int>>;

// The error ParseFormula raises for `formula`, or a note that it raised none.
Error Raised(const std::string& formula) {
  try {
    ParseFormula(formula, "composition.formula");
  } catch (const Error& error) {
    return error;
  }
  return Internal("no error for \"" + formula + "\"");
}

// Formulas and atomic numbers (Sr 38, Ti 22, O 8, Ca 20, P 15, H 1, C 6, Na 11, Cl 17): common
// practice, no source.
TEST(ParseFormula, ReadsSymbolsAndCountsInOrderOfFirstAppearance) {
  EXPECT_EQ(ParseFormula("SrTiO3"), (Terms{{38, 1}, {22, 1}, {8, 3}}));
  EXPECT_EQ(ParseFormula("H2O"), (Terms{{1, 2}, {8, 1}}));
  EXPECT_EQ(ParseFormula("NaCl"), (Terms{{11, 1}, {17, 1}}));
}

// Calcium phosphate Ca3(PO4)2 holds Ca 3, P 2, O 8: common practice, no source.
TEST(ParseFormula, MultipliesGroupsInParentheses) {
  EXPECT_EQ(ParseFormula("Ca3(PO4)2"), (Terms{{20, 3}, {15, 2}, {8, 8}}));
  // Nested groups multiply through every level: 2 x 3 of each.
  EXPECT_EQ(ParseFormula("((NaCl)2)3"), (Terms{{11, 6}, {17, 6}}));
  // A group without a count counts once.
  EXPECT_EQ(ParseFormula("Ca(OH)"), (Terms{{20, 1}, {8, 1}, {1, 1}}));
}

TEST(ParseFormula, IgnoresSpaces) {
  EXPECT_EQ(ParseFormula("Sr Ti O3"), ParseFormula("SrTiO3"));
  EXPECT_EQ(ParseFormula(" Ca3 (P O4) 2 "), ParseFormula("Ca3(PO4)2"));
}

// Acetic acid written as CH3COOH holds C 2, H 4, O 2: common practice, no source.
TEST(ParseFormula, MergesRepeatedElements) {
  EXPECT_EQ(ParseFormula("CH3COOH"), (Terms{{6, 2}, {1, 4}, {8, 2}}));
  EXPECT_EQ(ParseFormula("NaClNa"), (Terms{{11, 2}, {17, 1}}));
  EXPECT_EQ(ParseFormula("O(O2)3"), (Terms{{8, 7}}));
}

TEST(ParseFormula, NamesTheFieldItWasGiven) {
  EXPECT_EQ(Raised("Xx").field(), "composition.formula");
  try {
    ParseFormula("Xx");
    FAIL() << "no error";
  } catch (const Error& error) {
    EXPECT_EQ(error.field(), "formula") << "the default field name";
  }
}

// Each error says what was wrong, where (1-based character), and quotes the formula.
TEST(ParseFormula, RefusesBadFormulasNamingThePosition) {
  struct Bad {
    const char* formula;
    const char* detail;
  };
  const Bad cases[] = {
      {"Xx", "unknown element 'Xx' at character 1 of \"Xx\""},
      {"NaXx2", "unknown element 'Xx' at character 3 of \"NaXx2\""},
      {"NaCl)", "unexpected ')' at character 5 of \"NaCl)\""},
      {"(NaCl", "missing ')' at character 6 of \"(NaCl\""},
      {"Ca3(PO4", "missing ')' at character 8 of \"Ca3(PO4\""},
      {"", "no elements at character 1 of \"\""},
      {"   ", "no elements at character 4 of \"   \""},
      {"nacl", "expected an element symbol at character 1 of \"nacl\""},
      {"Na-Cl", "expected an element symbol at character 3 of \"Na-Cl\""},
  };
  for (const Bad& c : cases) {
    const Error error = Raised(c.formula);
    EXPECT_EQ(error.kind(), ErrorKind::kInvalidArgument) << c.formula << ": " << error.what();
    EXPECT_EQ(error.field(), "composition.formula") << c.formula;
    EXPECT_EQ(error.detail(), c.detail) << c.formula;
  }
}

// A count or group error points at the start of what is wrong, as the errors above do: the
// count's first digit, the '(' of an empty group.
TEST(ParseFormula, PointsAtTheStartOfABadCountOrGroup) {
  EXPECT_EQ(Raised("Na0Cl").detail(), "count 0 at character 3 of \"Na0Cl\"");
  EXPECT_EQ(Raised("(NaCl)0").detail(), "count 0 at character 7 of \"(NaCl)0\"");
  EXPECT_EQ(Raised("Na1000001").detail(), "count above 1000000 at character 3 of \"Na1000001\"");
  EXPECT_EQ(Raised("Na()").detail(), "empty parentheses at character 3 of \"Na()\"");
}

TEST(ParseFormula, RefusesTotalsAboveTheCountLimit) {
  EXPECT_NO_THROW(ParseFormula("Na1000000"));
  for (const char* formula : {"Na600000Na600000", "(Na1000)1001"}) {
    const Error error = Raised(formula);
    EXPECT_EQ(error.kind(), ErrorKind::kInvalidArgument) << formula;
    EXPECT_NE(error.detail().find("count above 1000000"), std::string::npos) << error.what();
  }
}

TEST(ParseFormula, RefusesParenthesesNestedTooDeeply) {
  const Error error = Raised("(((((((((((Na)))))))))))");
  EXPECT_EQ(error.kind(), ErrorKind::kInvalidArgument);
  EXPECT_NE(error.detail().find("nested too deeply"), std::string::npos) << error.what();
}

}  // namespace
}  // namespace nucleate::structure
