// CIF reading of bad input: every problem is a named error for its file, line and data block,
// the other blocks are still read, and nothing is allocated beyond the limits.
#include <cstdio>
#include <string>

#include <gtest/gtest.h>

#include "core/common/error.h"
#include "core/structure/io/cif_reader.h"
#include "tests/unit/io/io_test_support.h"

namespace nucleate::structure::io {
namespace {

using testing::CubicBlock;
using testing::ErrorText;
using testing::ReadDemo;

const char* kSites =
    "loop_\n_atom_site_label\n_atom_site_type_symbol\n_atom_site_fract_x\n_atom_site_fract_y\n"
    "_atom_site_fract_z\n";

// The single block's error: kind and exact what() text.
void ExpectError(const std::string& text, ErrorKind kind, const std::string& what) {
  const auto results = ReadDemo(text);
  ASSERT_FALSE(results.empty());
  ASSERT_TRUE(results[0].error) << "no error for:\n" << text;
  EXPECT_FALSE(results[0].crystal);
  EXPECT_EQ(results[0].error->kind(), kind) << results[0].error->what();
  EXPECT_EQ(ErrorText(results[0]), what);
}

TEST(CifReaderErrors, UnknownElementSymbolNamesFileLineAndTag) {
  // Line 14: data_ and six cell lines, then loop_ and five data names come first.
  const std::string text = CubicBlock("demo", 5, std::string(kSites) + "X1 Xx 0 0 0\n");
  ExpectError(text, ErrorKind::kInvalidArgument,
              "demo.cif:14: unknown element symbol 'Xx' in _atom_site_type_symbol (data block 'demo')");
}

TEST(CifReaderErrors, UnknownElementFromLabel) {
  const std::string text = CubicBlock(
      "lab", 5,
      "loop_\n_atom_site_label\n_atom_site_fract_x\n_atom_site_fract_y\n_atom_site_fract_z\nQq1 0 0 0\n");
  ExpectError(text, ErrorKind::kInvalidArgument,
              "demo.cif:13: unknown element symbol 'Qq' in _atom_site_label 'Qq1' (no "
              "_atom_site_type_symbol) (data block 'lab')");
}

TEST(CifReaderErrors, PartialOccupancyIsUnsupportedDisorder) {
  const std::string text = CubicBlock(
      "mixed", 5,
      "loop_\n_atom_site_label\n_atom_site_type_symbol\n_atom_site_fract_x\n_atom_site_fract_y\n"
      "_atom_site_fract_z\n_atom_site_occupancy\nNa1 Na 0 0 0 1\nFe1 Fe 0.5 0.5 0.5 0.5(1)\n");
  ExpectError(text, ErrorKind::kUnsupported,
              "demo.cif:16: site 'Fe1' has occupancy 0.5(1): partial occupancy (disorder) is not "
              "supported (data block 'mixed')");
}

TEST(CifReaderErrors, OccupancyWithinToleranceOfOneIsFull) {
  const std::string text = CubicBlock(
      "full", 5,
      "loop_\n_atom_site_label\n_atom_site_fract_x\n_atom_site_fract_y\n_atom_site_fract_z\n"
      "_atom_site_occupancy\nNa1 0 0 0 0.9995\nCl1 0.5 0.5 0.5 1.0004\n");
  const auto results = ReadDemo(text);
  ASSERT_TRUE(results[0].crystal) << ErrorText(results[0]);
  EXPECT_EQ(results[0].crystal->size(), 2u);
}

TEST(CifReaderErrors, TwoElementsOnOneSiteIsDisorder) {
  const std::string text = CubicBlock("overlap", 5, std::string(kSites) + "Na1 Na 0 0 0\nK1 K 0 0 0.0001\n");
  const auto results = ReadDemo(text);
  ASSERT_TRUE(results[0].error);
  EXPECT_EQ(results[0].error->kind(), ErrorKind::kUnsupported);
  EXPECT_EQ(results[0].error->field(), "demo.cif:15");
  EXPECT_NE(ErrorText(results[0]).find("site 'K1' (K) lies on site 'Na1' (Na)"), std::string::npos)
      << ErrorText(results[0]);
}

TEST(CifReaderErrors, UnterminatedSemicolonField) {
  const std::string text = CubicBlock("open", 5, "_publ_section_title\n;Title that never ends\n") +
                           kSites + "Na1 Na 0 0 0\n";
  ExpectError(text, ErrorKind::kInvalidArgument,
              "demo.cif:9: unterminated semicolon text field (no line starting with ';' closes it) "
              "(data block 'open')");
}

TEST(CifReaderErrors, UnterminatedQuote) {
  const std::string text = CubicBlock("quote", 5, "_chemical_name_common 'rock salt\n") + kSites +
                           "Na1 Na 0 0 0\n";
  ExpectError(text, ErrorKind::kInvalidArgument,
              "demo.cif:8: unterminated quoted string (no closing ' followed by whitespace on this "
              "line) (data block 'quote')");
}

TEST(CifReaderErrors, LoopRowCountNotAMultipleOfItsTags) {
  // A file cut in the middle of a row.
  const std::string text = CubicBlock("cut", 5, std::string(kSites) + "Na1 Na 0 0 0\nCl1 Cl 0.5 0.5\n");
  ExpectError(text, ErrorKind::kInvalidArgument,
              "demo.cif:8: loop_ of _atom_site_label has 9 values, not a multiple of its 5 data "
              "names (truncated or garbled loop) (data block 'cut')");
}

TEST(CifReaderErrors, MissingCellParameter) {
  const std::string text = std::string("data_nocell\n_cell_length_a 5\n_cell_length_b 5\n") + kSites +
                           "Na1 Na 0 0 0\n";
  ExpectError(text, ErrorKind::kInvalidArgument,
              "demo.cif:1: missing _cell_length_c (a crystal needs its full unit cell) (data block "
              "'nocell')");
}

TEST(CifReaderErrors, UnknownCellValue) {
  const std::string text = "data_q\n_cell_length_a ?\n_cell_length_b 5\n_cell_length_c 5\n"
                           "_cell_angle_alpha 90\n_cell_angle_beta 90\n_cell_angle_gamma 90\n" +
                           std::string(kSites) + "Na1 Na 0 0 0\n";
  ExpectError(text, ErrorKind::kInvalidArgument,
              "demo.cif:2: no value ('?') for _cell_length_a (data block 'q')");
}

TEST(CifReaderErrors, NegativeLengthAndNaN) {
  std::string text = CubicBlock("neg", -5, std::string(kSites) + "Na1 Na 0 0 0\n");
  ExpectError(text, ErrorKind::kInvalidArgument,
              "demo.cif:2: _cell_length_a: must be a positive finite length in angstrom (zero or "
              "negative cell volume) (data block 'neg')");
  text = "data_nan\n_cell_length_a NaN\n";
  ExpectError(text, ErrorKind::kInvalidArgument,
              "demo.cif:2: 'NaN' in _cell_length_a is not a number (data block 'nan')");
  text = CubicBlock("nanx", 5, std::string(kSites) + "Na1 Na nan 0 0\n");
  ExpectError(text, ErrorKind::kInvalidArgument,
              "demo.cif:14: 'nan' in _atom_site_fract_x is not a number (data block 'nanx')");
}

TEST(CifReaderErrors, ZeroVolumeFromAngles) {
  // alpha = beta + gamma closes no cell: the three cell vectors are coplanar.
  const std::string text = "data_flat\n_cell_length_a 5\n_cell_length_b 5\n_cell_length_c 5\n"
                           "_cell_angle_alpha 120\n_cell_angle_beta 60\n_cell_angle_gamma 60\n" +
                           std::string(kSites) + "Na1 Na 0 0 0\n";
  const auto results = ReadDemo(text);
  ASSERT_TRUE(results[0].error);
  EXPECT_EQ(results[0].error->kind(), ErrorKind::kInvalidArgument);
  EXPECT_EQ(results[0].error->field(), "demo.cif:7");
  EXPECT_NE(ErrorText(results[0]).find("zero or negative cell volume"), std::string::npos)
      << ErrorText(results[0]);
}

TEST(CifReaderErrors, AbsurdCellIsAboveTheLimit) {
  const std::string text = CubicBlock("huge", 1e9, std::string(kSites) + "Na1 Na 0 0 0\n");
  const auto results = ReadDemo(text);
  ASSERT_TRUE(results[0].error);
  EXPECT_EQ(results[0].error->kind(), ErrorKind::kLimitExceeded);
  EXPECT_EQ(results[0].error->field(), "demo.cif:2");
}

TEST(CifReaderErrors, LoopWithMoreSitesThanMaxAtomsIsRefusedWhileReading) {
  CifReadOptions options;
  options.limits.max_atoms = 3;
  std::string text = CubicBlock("many", 20, kSites);
  for (int i = 0; i < 10; ++i) text += "Na" + std::to_string(i) + " Na 0." + std::to_string(i) + " 0 0\n";
  const auto results = ReadDemo(text, 1, options);
  ASSERT_TRUE(results[0].error);
  EXPECT_EQ(results[0].error->kind(), ErrorKind::kLimitExceeded);
  EXPECT_EQ(ErrorText(results[0]),
            "demo.cif:8: loop of _atom_site_label has more than 3 rows, above the limit (data block "
            "'many')");
}

TEST(CifReaderErrors, ExpansionBeyondMaxAtomsIsRefused) {
  CifReadOptions options;
  options.limits.max_atoms = 3;
  const std::string text = CubicBlock(
      "grow", 5,
      "loop_\n_symmetry_equiv_pos_as_xyz\nx,y,z\n-x,y,z\nx,-y,z\nx,y,-z\n" + std::string(kSites) +
          "Na1 Na 0.1 0.2 0.3\n");
  const auto results = ReadDemo(text, 1, options);
  ASSERT_TRUE(results[0].error);
  EXPECT_EQ(results[0].error->kind(), ErrorKind::kLimitExceeded);
  EXPECT_NE(ErrorText(results[0]).find("more than 3 atoms"), std::string::npos);
}

TEST(CifReaderErrors, GarbledSymmetryOperation) {
  const std::string text = CubicBlock("badop", 5, "loop_\n_symmetry_equiv_pos_as_xyz\nx,y,z\n'x,y,w'\n" +
                                                      std::string(kSites) + "Na1 Na 0 0 0\n");
  ExpectError(text, ErrorKind::kInvalidArgument,
              "demo.cif:11: symmetry operation 'x,y,w' has an unreadable part 'w' in "
              "_symmetry_equiv_pos_as_xyz (data block 'badop')");
}

TEST(CifReaderErrors, CartesianOnlySitesAreUnsupported) {
  const std::string text = CubicBlock(
      "cart", 5, "loop_\n_atom_site_label\n_atom_site_Cartn_x\n_atom_site_Cartn_y\n_atom_site_Cartn_z\nNa1 0 0 0\n");
  const auto results = ReadDemo(text);
  ASSERT_TRUE(results[0].error);
  EXPECT_EQ(results[0].error->kind(), ErrorKind::kUnsupported);
}

TEST(CifReaderErrors, TagWithoutValueAndDuplicateTag) {
  ExpectError("data_a\n_cell_length_a\n_cell_length_b 5\n", ErrorKind::kInvalidArgument,
              "demo.cif:2: data name _cell_length_a has no value (data block 'a')");
  ExpectError("data_b\n_cell_length_a 5\n_cell_length_a 6\n", ErrorKind::kInvalidArgument,
              "demo.cif:3: data name _cell_length_a appears twice in the block (CIF 1.1 forbids "
              "this) (data block 'b')");
}

TEST(CifReaderErrors, GarbledBinaryAndEmptyFiles) {
  auto results = ReadCif(std::string("\x7f" "ELF\x02\x01\x01\0\0\0", 10), "a.out");
  ASSERT_EQ(results.size(), 1u);
  ASSERT_TRUE(results[0].error);
  EXPECT_EQ(results[0].error->field(), "a.out:1");
  results = ReadCif("", "empty.cif");
  ASSERT_EQ(results.size(), 1u);
  EXPECT_EQ(ErrorText(results[0]), "empty.cif:1: no data_ block found (empty or not a CIF file)");
  results = ReadCif("_cell_length_a 5\n", "nohead.cif");
  ASSERT_EQ(results.size(), 1u);
  EXPECT_EQ(results[0].error->field(), "nohead.cif:1");
}

TEST(CifReaderErrors, BadSecondBlockLeavesFirstAndThird) {
  const std::string good1 = CubicBlock("first", 5, std::string(kSites) + "Na1 Na 0 0 0\n");
  const std::string bad = CubicBlock("second", 5, "_title 'never closed\n") + kSites + "Cl1 Cl 0 0 0\n";
  const std::string good3 = CubicBlock("third", 6, std::string(kSites) + "K1 K 0 0 0\n");
  const auto results = ReadDemo(good1 + bad + good3, 3);
  ASSERT_TRUE(results[0].crystal) << ErrorText(results[0]);
  EXPECT_EQ(results[0].crystal->label, "first");
  EXPECT_EQ(results[1].block_name, "second");
  ASSERT_TRUE(results[1].error);
  EXPECT_EQ(results[1].error->field(), "demo.cif:22");
  ASSERT_TRUE(results[2].crystal) << ErrorText(results[2]);
  EXPECT_EQ(results[2].crystal->label, "third");
  EXPECT_EQ(results[2].crystal->numbers, std::vector<int>{19});
  EXPECT_EQ(results[2].line, 30);
}

TEST(CifReaderErrors, UnterminatedTextFieldInSecondBlockStillLeavesThird) {
  const std::string good1 = CubicBlock("first", 5, std::string(kSites) + "Na1 Na 0 0 0\n");
  const std::string bad = CubicBlock("second", 5, "_remark\n;never closed\n") + kSites + "Cl1 Cl 0 0 0\n";
  const std::string good3 = CubicBlock("third", 6, std::string(kSites) + "K1 K 0 0 0\n");
  const auto results = ReadDemo(good1 + bad + good3, 3);
  EXPECT_TRUE(results[0].crystal);
  EXPECT_TRUE(results[1].error);
  EXPECT_TRUE(results[2].crystal);
}

TEST(CifReaderErrors, TruncatedLoopInSecondBlockStillLeavesThird) {
  // The loop's last row is cut short and the next data_ header follows at once.
  const std::string good1 = CubicBlock("first", 5, std::string(kSites) + "Na1 Na 0 0 0\n");
  const std::string bad = CubicBlock("second", 5, std::string(kSites) + "Cl1 Cl 0 0\n");
  const std::string good3 = CubicBlock("third", 6, std::string(kSites) + "K1 K 0 0 0\n");
  const auto results = ReadDemo(good1 + bad + good3, 3);
  EXPECT_TRUE(results[0].crystal);
  ASSERT_TRUE(results[1].error);
  EXPECT_EQ(results[1].error->field(), "demo.cif:22");
  ASSERT_TRUE(results[2].crystal) << ErrorText(results[2]);
  EXPECT_EQ(results[2].crystal->label, "third");
}

TEST(CifReaderErrors, ManyKeptItemsAreCapped) {
  // Thousands of distinct _atom_site_* items: each is kept, so their number is capped too.
  CifReadOptions options;
  options.limits.max_atoms = 1;  // budget 64 + 4 * 1536 + 10000 values
  std::string text = CubicBlock("items", 5, "");
  for (int i = 0; i < 20000; ++i) text += "_atom_site_extra_" + std::to_string(i) + " 1\n";
  const auto results = ReadDemo(text, 1, options);
  ASSERT_TRUE(results[0].error);
  EXPECT_EQ(results[0].error->kind(), ErrorKind::kLimitExceeded);
  EXPECT_NE(ErrorText(results[0]).find("values of the kinds read"), std::string::npos);
}

TEST(CifReaderErrors, SemanticErrorInSecondBlockLeavesOthers) {
  const std::string good1 = CubicBlock("first", 5, std::string(kSites) + "Na1 Na 0 0 0\n");
  const std::string bad = CubicBlock("second", 5, std::string(kSites) + "Xx1 Xx 0 0 0\n");
  const std::string good3 = CubicBlock("third", 6, std::string(kSites) + "K1 K 0 0 0\n");
  const auto results = ReadDemo(good1 + bad + good3, 3);
  EXPECT_TRUE(results[0].crystal);
  ASSERT_TRUE(results[1].error);
  EXPECT_EQ(results[1].error->field(), "demo.cif:28");
  EXPECT_TRUE(results[2].crystal);
}

TEST(CifReaderErrors, FileLevelProblems) {
  try {
    ReadCifFile("/nonexistent/dir/x.cif");
    ADD_FAILURE() << "no error";
  } catch (const Error& e) {
    EXPECT_EQ(e.kind(), ErrorKind::kIo);
    EXPECT_EQ(e.field(), "/nonexistent/dir/x.cif");
  }
  CifReadOptions bad;
  bad.limits.max_atoms = 0;
  EXPECT_THROW(ReadCif("data_a\n", "a.cif", bad), Error);
}

TEST(CifReaderErrors, OversizedFileRefusedBeforeReading) {
  const std::string path = ::testing::TempDir() + "/nucleate_io_big.cif";
  {
    FILE* f = std::fopen(path.c_str(), "wb");
    ASSERT_NE(f, nullptr);
    const std::string line = "# filler\n";
    for (int i = 0; i < 200; ++i) std::fputs(line.c_str(), f);
    std::fclose(f);
  }
  CifReadOptions options;
  options.max_file_bytes = 1000;
  try {
    ReadCifFile(path, options);
    ADD_FAILURE() << "no error";
  } catch (const Error& e) {
    EXPECT_EQ(e.kind(), ErrorKind::kLimitExceeded);
    EXPECT_EQ(e.field(), path);
  }
  std::remove(path.c_str());
}

TEST(CifReaderErrors, TooManyBlocksStops) {
  CifReadOptions options;
  options.max_blocks = 2;
  std::string text;
  for (int i = 0; i < 5; ++i) text += "data_b" + std::to_string(i) + "\n";
  const auto results = ReadCif(text, "many.cif", options);
  ASSERT_EQ(results.size(), 3u);
  ASSERT_TRUE(results[2].error);
  EXPECT_EQ(results[2].error->kind(), ErrorKind::kLimitExceeded);
}

}  // namespace
}  // namespace nucleate::structure::io
