#include "core/structure/io/text_number.h"

#include <clocale>

#include <gtest/gtest.h>

namespace nucleate::structure::io {
namespace {

TEST(ParseCifNumber, DropsTheStandardUncertainty) {
  // CIF 1.1 specification, numeric values: "5.431(2)" is 5.431 with s.u. 0.002.
  EXPECT_DOUBLE_EQ(*ParseCifNumber("5.431(2)"), 5.431);
  EXPECT_DOUBLE_EQ(*ParseCifNumber("-0.25(13)"), -0.25);
  EXPECT_DOUBLE_EQ(*ParseCifNumber("1.2e3(4)"), 1200.0);
  EXPECT_DOUBLE_EQ(*ParseCifNumber("90"), 90.0);
  EXPECT_DOUBLE_EQ(*ParseCifNumber(".5"), 0.5);
  EXPECT_DOUBLE_EQ(*ParseCifNumber("5."), 5.0);
  EXPECT_DOUBLE_EQ(*ParseCifNumber("+2"), 2.0);
}

TEST(ParseCifNumber, RefusesWhatIsNotANumber) {
  for (const char* text : {"", "?", ".", "abc", "5.4.3", "5.431(", "5.431()", "5.431(2", "5.431(x)",
                           "5.431(2)3", "nan", "NaN", "inf", "-inf", "1e", "1e999", "0x10", "1,5"}) {
    EXPECT_FALSE(ParseCifNumber(text).has_value()) << text;
  }
}

TEST(ParseDecimal, IgnoresTheCLocale) {
  // A host program may switch LC_NUMERIC to a locale with a decimal comma; the files are still
  // written with a point (common practice, no source). Skips only the locale switch if absent.
  const char* previous = std::setlocale(LC_NUMERIC, nullptr);
  const std::string saved = previous ? previous : "C";
  std::setlocale(LC_NUMERIC, "de_DE.UTF-8");
  EXPECT_DOUBLE_EQ(*ParseDecimal("1.5"), 1.5);
  EXPECT_EQ(FormatFixed(1.5, 2), "1.50");
  std::setlocale(LC_NUMERIC, saved.c_str());
}

TEST(FormatFixed, WritesNoNegativeZero) {
  EXPECT_EQ(FormatFixed(-1e-12, 8), "0.00000000");
  EXPECT_EQ(FormatFixed(-0.5, 3), "-0.500");
  EXPECT_EQ(FormatFixed(5.64, 6), "5.640000");
}

TEST(FormatShortest, RoundTripsExactly) {
  for (double x : {0.1, 1.0 / 3.0, -2.5e-300, 12345.678901234567, 5.64}) {
    EXPECT_EQ(*ParseDecimal(FormatShortest(x)), x);
  }
}

}  // namespace
}  // namespace nucleate::structure::io
