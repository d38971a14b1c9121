#include "core/train/data/properties_csv.h"

#include <string>

#include <gtest/gtest.h>

#include "core/common/error.h"

namespace nucleate::train::data {
namespace {

std::string FieldOf(const std::string& text) {
  DatasetReport report;
  try {
    ParsePropertiesCsv(text, "p.csv", report);
  } catch (const Error& e) {
    return e.field() + " | " + e.detail();
  }
  return "(no error)";
}

// Quoting rules of RFC 4180, section 2 (fields in double quotes, "" for a quote, CRLF line ends).
TEST(PropertiesCsv, ReadsQuotedFieldsCrlfAndAByteOrderMark) {
  DatasetReport report;
  const PropertyTable table = ParsePropertiesCsv(
      "\xEF\xBB\xBF" "file,gap,\"energy, per atom\"\r\n"
      "a.cif,1.5,-2\r\n"
      "\r\n"
      "\"b,\"\"odd\"\" name.cif\", 2.5 ,\"\"\r\n",
      "p.csv", report);
  EXPECT_EQ(table.columns, (std::vector<std::string>{"gap", "energy, per atom"}));
  ASSERT_EQ(table.rows.size(), 2u);
  EXPECT_EQ(table.rows[0].key, "a.cif");
  EXPECT_EQ(table.rows[0].line, 2);
  EXPECT_EQ(table.rows[0].values, (std::vector<std::string>{"1.5", "-2"}));
  EXPECT_EQ(table.rows[1].key, "b,\"odd\" name.cif");
  EXPECT_EQ(table.rows[1].line, 4);  // the blank line 3 is skipped but counted
  EXPECT_EQ(table.rows[1].values, (std::vector<std::string>{"2.5", ""}));
  EXPECT_TRUE(report.problems.empty());
}

TEST(PropertiesCsv, MalformedRowsAreProblemsNamedByLine) {
  DatasetReport report;
  const PropertyTable table = ParsePropertiesCsv(
      "file,gap\n"
      "a.cif,1,2\n"        // one field too many
      "b.cif\n"            // one too few
      "\"c.cif,1\n"        // unterminated quote
      ",3\n"               // no key
      "d.cif,4\n",
      "p.csv", report);
  ASSERT_EQ(table.rows.size(), 1u);
  EXPECT_EQ(table.rows[0].key, "d.cif");
  EXPECT_EQ(report.property_rows_rejected, 4);
  ASSERT_EQ(report.problems.size(), 4u);
  EXPECT_EQ(report.problems[0].source, "p.csv:2");
  EXPECT_EQ(report.problems[1].source, "p.csv:3");
  EXPECT_EQ(report.problems[2].source, "p.csv:4");
  EXPECT_EQ(report.problems[3].source, "p.csv:5");
}

TEST(PropertiesCsv, BadHeadersAreErrors) {
  EXPECT_EQ(FieldOf(""), "p.csv | no header line 'file,<property>,...'");
  EXPECT_EQ(FieldOf("name,gap\n"),
            "p.csv | the header must start with the column 'file', found 'name'");
  EXPECT_EQ(FieldOf("file,gap,gap\n"), "p.csv | header names the column 'gap' twice");
  EXPECT_EQ(FieldOf("file,,gap\n"), "p.csv | header column 2 is empty");
}

}  // namespace
}  // namespace nucleate::train::data
