// CIF reading: syntax features and symmetry expansion. Data names from the IUCr CIF core
// dictionary; syntax from the CIF 1.1 specification.
#include "core/structure/io/cif_reader.h"

#include <cmath>
#include <string>

#include <gtest/gtest.h>

#include "core/elements/elements.h"
#include "tests/unit/io/io_test_support.h"

namespace nucleate::structure::io {
namespace {

using testing::CubicBlock;
using testing::ErrorText;
using testing::HasSite;
using testing::ReadDemo;

// Does one of the block's warnings start with `prefix`?
bool HasWarning(const CifBlockResult& r, const std::string& prefix) {
  for (const std::string& w : r.warnings) {
    if (w.rfind(prefix, 0) == 0) return true;
  }
  ADD_FAILURE() << "no warning starting with '" << prefix << "' among " << r.warnings.size();
  for (const std::string& w : r.warnings) ADD_FAILURE() << "  " << w;
  return false;
}

// The 192 operations of Fm-3m (No. 225) in its standard setting: the 48 signed permutation
// matrices of point group m-3m combined with the four F-centring translations (International
// Tables A, group 225: symmorphic, origin at m-3m; from memory). Written as x,y,z text by this
// test, independently of the library's formatter.
std::string Fm3mOperationsLoop() {
  const char* axes[3] = {"x", "y", "z"};
  const int perms[6][3] = {{0, 1, 2}, {0, 2, 1}, {1, 0, 2}, {1, 2, 0}, {2, 0, 1}, {2, 1, 0}};
  const char* centring[4][3] = {{"", "", ""}, {"", "+1/2", "+1/2"}, {"+1/2", "", "+1/2"},
                                {"+1/2", "+1/2", ""}};
  std::string loop = "loop_\n_space_group_symop_operation_xyz\n";
  for (const auto& t : centring) {
    for (const auto& p : perms) {
      for (int signs = 0; signs < 8; ++signs) {
        std::string op = "'";
        for (int k = 0; k < 3; ++k) {
          if (k) op += ",";
          op += ((signs >> k) & 1) ? "-" : "";
          op += axes[p[k]];
          op += t[k];
        }
        loop += op + "'\n";
      }
    }
  }
  return loop;
}

TEST(CifReader, RockSaltFromFm3mOperationsGivesEightAtoms) {
  const std::string text =
      CubicBlock("NaCl", 5.64,
                 "_space_group_name_H-M_alt 'F m -3 m'\n_space_group_IT_number 225\n" +
                     Fm3mOperationsLoop() +
                     "loop_\n_atom_site_label\n_atom_site_type_symbol\n_atom_site_fract_x\n"
                     "_atom_site_fract_y\n_atom_site_fract_z\n_atom_site_occupancy\n"
                     "Na1 Na 0 0 0 1\nCl1 Cl 0.5 0.5 0.5 1.0\n");
  const auto results = ReadDemo(text);
  ASSERT_TRUE(results[0].crystal) << ErrorText(results[0]);
  const Crystal& c = *results[0].crystal;
  EXPECT_EQ(c.label, "NaCl");
  EXPECT_EQ(results[0].space_group_name, "F m -3 m");
  EXPECT_EQ(results[0].space_group_number, 225);
  EXPECT_TRUE(results[0].warnings.empty());
  ASSERT_EQ(c.size(), 8u);
  int na = 0;
  for (int z : c.numbers) na += z == 11;
  EXPECT_EQ(na, 4);
  // Rock salt: Na on the fcc lattice points, Cl shifted by (1/2, 0, 0) (from memory).
  for (const Eigen::Vector3d& p : {Eigen::Vector3d(0, 0, 0), Eigen::Vector3d(0, 0.5, 0.5),
                                   Eigen::Vector3d(0.5, 0, 0.5), Eigen::Vector3d(0.5, 0.5, 0)}) {
    EXPECT_TRUE(HasSite(c.frac, p));
    EXPECT_TRUE(HasSite(c.frac, p + Eigen::Vector3d(0.5, 0, 0)));
  }
  for (const Eigen::Vector3d& f : c.frac) {
    for (int k = 0; k < 3; ++k) {
      EXPECT_GE(f[k], 0.0);
      EXPECT_LT(f[k], 1.0);
    }
  }
  EXPECT_DOUBLE_EQ(c.lattice(0, 0), 5.64);
  EXPECT_EQ(c.lattice(0, 1), 0.0);
}

TEST(CifReader, WurtziteFromOldTagsWithHexagonalOperations) {
  // P 63 m c (No. 186), the 12 operations of International Tables A (from memory), under the
  // older _symmetry_* names, with standard uncertainties on the numbers.
  const std::string text =
      "data_ZnO\n"
      "_symmetry_space_group_name_H-M 'P 63 m c'\n_symmetry_Int_Tables_number 186\n"
      "_cell_length_a 3.2496(2)\n_cell_length_b 3.2496(2)\n_cell_length_c 5.2042(3)\n"
      "_cell_angle_alpha 90\n_cell_angle_beta 90\n_cell_angle_gamma 120\n"
      "loop_\n_symmetry_equiv_pos_as_xyz\n"
      "x,y,z\n-y,x-y,z\n-x+y,-x,z\n-x,-y,z+1/2\ny,-x+y,z+1/2\nx-y,x,z+1/2\n"
      "-y,-x,z\n-x+y,y,z\nx,x-y,z\ny,x,z+1/2\nx-y,-y,z+1/2\n-x,-x+y,z+1/2\n"
      "loop_\n_atom_site_label\n_atom_site_fract_x\n_atom_site_fract_y\n_atom_site_fract_z\n"
      "Zn1 0.3333333 0.6666667 0.0\nO1 0.3333333 0.6666667 0.3821(5)\n";
  const auto results = ReadDemo(text);
  ASSERT_TRUE(results[0].crystal) << ErrorText(results[0]);
  const Crystal& c = *results[0].crystal;
  EXPECT_EQ(results[0].space_group_name, "P 63 m c");
  EXPECT_EQ(results[0].space_group_number, 186);
  ASSERT_EQ(c.size(), 4u);  // Zn and O each on 2b (from memory)
  EXPECT_TRUE(HasSite(c.frac, {1.0 / 3, 2.0 / 3, 0.0}, 1e-6));
  EXPECT_TRUE(HasSite(c.frac, {2.0 / 3, 1.0 / 3, 0.5}, 1e-6));
  EXPECT_TRUE(HasSite(c.frac, {2.0 / 3, 1.0 / 3, 0.8821}, 1e-6));
  EXPECT_NEAR(c.lattice.row(1).norm(), 3.2496, 1e-12);
  EXPECT_NEAR(std::acos(c.lattice.row(0).normalized().dot(c.lattice.row(1).normalized())) * 180 /
                  M_PI,
              120.0, 1e-9);
}

TEST(CifReader, ElementFromLabelWhenNoTypeSymbol) {
  const std::string text = CubicBlock(
      "labels", 10,
      "loop_\n_atom_site_label\n_atom_site_fract_x\n_atom_site_fract_y\n_atom_site_fract_z\n"
      "Fe1 0.1 0.1 0.1\nO2- 0.2 0.2 0.2\nCa1a 0.3 0.3 0.3\nCO1 0.4 0.4 0.4\nCo1 0.5 0.5 0.5\n");
  const auto results = ReadDemo(text);
  ASSERT_TRUE(results[0].crystal) << ErrorText(results[0]);
  EXPECT_EQ(results[0].crystal->numbers, (std::vector<int>{26, 8, 20, 6, 27}));
}

TEST(CifReader, TypeSymbolWithChargeAndAnyCase) {
  const std::string text = CubicBlock(
      "types", 10,
      "loop_\n_atom_site_label\n_atom_site_type_symbol\n_atom_site_fract_x\n_atom_site_fract_y\n"
      "_atom_site_fract_z\nA1 Fe3+ 0.1 0.1 0.1\nA2 O2- 0.2 0.2 0.2\nA3 NA 0.3 0.3 0.3\nA4 cl 0.4 0.4 0.4\n");
  const auto results = ReadDemo(text);
  ASSERT_TRUE(results[0].crystal) << ErrorText(results[0]);
  EXPECT_EQ(results[0].crystal->numbers, (std::vector<int>{26, 8, 11, 17}));
}

TEST(CifReader, NullValuesQuotedValuesAndTextFieldsInLoops) {
  // '?' occupancy is unknown, so full (CIF core dictionary default 1.0); quoted labels and a text
  // field as a value in another loop are parsed and ignored.
  const std::string text = CubicBlock(
      "nulls", 4,
      "_journal_name_full\n;A text field\nspanning lines\n;\n"
      "loop_\n_atom_site_label\n_atom_site_type_symbol\n_atom_site_fract_x\n_atom_site_fract_y\n"
      "_atom_site_fract_z\n_atom_site_occupancy\n_atom_site_U_iso_or_equiv\n"
      "'Si 1' Si 0 0 0 ? .\n\"Si 2\" Si 0.25 0.25 0.25 . 0.01(2)\n"
      "loop_\n_publ_author_name\n'O''Brien, A.'\n\"Smith, J.\"\n");
  const auto results = ReadDemo(text);
  ASSERT_TRUE(results[0].crystal) << ErrorText(results[0]);
  EXPECT_EQ(results[0].crystal->size(), 2u);
}

TEST(CifReader, NewAndDottedNamesAreFolded) {
  // DDLm writes _atom_site.fract_x; data names are case-insensitive (CIF 1.1 specification).
  const std::string text =
      "data_dotted\n_Cell.Length_A 4\n_cell.length_b 4\n_CELL_LENGTH_C 4\n_cell.angle_alpha 90\n"
      "_cell.angle_beta 90\n_cell.angle_gamma 90\n"
      "loop_\n_space_group_symop.operation_xyz\n'x, y, z'\n'-x, -y, -z'\n"
      "loop_\n_atom_site.label\n_atom_site.type_symbol\n_atom_site.fract_x\n_atom_site.fract_y\n"
      "_atom_site.fract_z\nCu1 Cu 0.1 0.2 0.3\n";
  const auto results = ReadDemo(text);
  ASSERT_TRUE(results[0].crystal) << ErrorText(results[0]);
  const Crystal& c = *results[0].crystal;
  ASSERT_EQ(c.size(), 2u);
  EXPECT_TRUE(HasSite(c.frac, {0.9, 0.8, 0.7}));
}

TEST(CifReader, SingleSiteAsPlainItems) {
  const std::string text = CubicBlock(
      "single", 3, "_atom_site_label Po1\n_atom_site_fract_x 0\n_atom_site_fract_y 0\n_atom_site_fract_z 0\n");
  const auto results = ReadDemo(text);
  ASSERT_TRUE(results[0].crystal) << ErrorText(results[0]);
  EXPECT_EQ(results[0].crystal->numbers, std::vector<int>{84});
}

TEST(CifReader, SpecialPositionImagesMergeWithinTolerance) {
  // Coordinates printed with 4 decimals: the images of a site on a mirror differ by rounding,
  // 1e-4 * 10 A = 0.001 A, below the 0.01 A default; one site results.
  const std::string text = CubicBlock(
      "special", 10,
      "loop_\n_symmetry_equiv_pos_as_xyz\nx,y,z\n-x,y,z\n"
      "loop_\n_atom_site_type_symbol\n_atom_site_fract_x\n_atom_site_fract_y\n_atom_site_fract_z\n"
      "K 0.00005 0.2 0.3\nK 0.25 0.2 0.3\n");
  const auto results = ReadDemo(text);
  ASSERT_TRUE(results[0].crystal) << ErrorText(results[0]);
  EXPECT_EQ(results[0].crystal->size(), 3u);
}

TEST(CifReader, MergeToleranceIsAnOption) {
  const std::string text = CubicBlock(
      "special", 10,
      "loop_\n_symmetry_equiv_pos_as_xyz\nx,y,z\n-x,y,z\n"
      "loop_\n_atom_site_type_symbol\n_atom_site_fract_x\n_atom_site_fract_y\n_atom_site_fract_z\n"
      "K 0.00005 0.2 0.3\n");
  CifReadOptions options;
  options.merge_tolerance = 0.0005;  // below the 0.001 A separation
  const auto results = ReadDemo(text, 1, options);
  ASSERT_TRUE(results[0].crystal) << ErrorText(results[0]);
  EXPECT_EQ(results[0].crystal->size(), 2u);
}

TEST(CifReader, DuplicateListedSiteOfSameElementIsMergedWithWarning) {
  const std::string text = CubicBlock(
      "dup", 5,
      "loop_\n_atom_site_label\n_atom_site_fract_x\n_atom_site_fract_y\n_atom_site_fract_z\n"
      "Cu1 0.5 0.5 0.5\nCu2 0.5 0.5 0.5\n");
  const auto results = ReadDemo(text);
  ASSERT_TRUE(results[0].crystal) << ErrorText(results[0]);
  EXPECT_EQ(results[0].crystal->size(), 1u);
  EXPECT_TRUE(HasWarning(results[0], "demo.cif:14: site 'Cu2' coincides with site 'Cu1'"));
}

TEST(CifReader, NoOperationsReadsAsP1WithWarning) {
  const std::string text = CubicBlock(
      "noops", 5,
      "_symmetry_space_group_name_H-M 'F m -3 m'\n"
      "loop_\n_atom_site_label\n_atom_site_fract_x\n_atom_site_fract_y\n_atom_site_fract_z\n"
      "Na1 0 0 0\nCl1 0.5 0.5 0.5\n");
  const auto results = ReadDemo(text);
  ASSERT_TRUE(results[0].crystal) << ErrorText(results[0]);
  EXPECT_EQ(results[0].crystal->size(), 2u);
  ASSERT_EQ(results[0].warnings.size(), 1u);
  EXPECT_EQ(results[0].warnings[0].rfind("demo.cif:1: no symmetry operations", 0), 0u)
      << results[0].warnings[0];
  EXPECT_NE(results[0].warnings[0].find("'F m -3 m'"), std::string::npos);
}

TEST(CifReader, NoOperationsAndNoSpaceGroupWarns) {
  // Nothing says the listed sites are the whole cell: reading them so is an assumption.
  const std::string text = CubicBlock(
      "bare", 5,
      "loop_\n_atom_site_label\n_atom_site_fract_x\n_atom_site_fract_y\n_atom_site_fract_z\n"
      "Na1 0 0 0\n");
  const auto results = ReadDemo(text);
  ASSERT_TRUE(results[0].crystal) << ErrorText(results[0]);
  ASSERT_EQ(results[0].warnings.size(), 1u);
  EXPECT_TRUE(HasWarning(results[0], "demo.cif:1: no symmetry operations"));
}

TEST(CifReader, NoOperationsInP1IsQuiet) {
  const std::string text = CubicBlock(
      "p1", 5,
      "_symmetry_space_group_name_H-M 'P 1'\n"
      "loop_\n_atom_site_label\n_atom_site_fract_x\n_atom_site_fract_y\n_atom_site_fract_z\n"
      "Na1 0 0 0\n");
  const auto results = ReadDemo(text);
  ASSERT_TRUE(results[0].crystal) << ErrorText(results[0]);
  EXPECT_TRUE(results[0].warnings.empty());
}

TEST(CifReader, CoordinatesAreWrapped) {
  const std::string text = CubicBlock(
      "wrap", 5,
      "loop_\n_atom_site_label\n_atom_site_fract_x\n_atom_site_fract_y\n_atom_site_fract_z\n"
      "Na1 -0.25 1.5 1.0\n");
  const auto results = ReadDemo(text);
  ASSERT_TRUE(results[0].crystal) << ErrorText(results[0]);
  const Eigen::Vector3d f = results[0].crystal->frac[0];
  EXPECT_DOUBLE_EQ(f[0], 0.75);
  EXPECT_DOUBLE_EQ(f[1], 0.5);
  EXPECT_DOUBLE_EQ(f[2], 0.0);
}

TEST(CifReader, StatedVolumeMismatchWarns) {
  const std::string text = CubicBlock(
      "vol", 5,
      "_cell_volume 100.0\nloop_\n_atom_site_label\n_atom_site_fract_x\n_atom_site_fract_y\n"
      "_atom_site_fract_z\nNa1 0 0 0\n");
  const auto results = ReadDemo(text);
  ASSERT_TRUE(results[0].crystal) << ErrorText(results[0]);
  EXPECT_TRUE(HasWarning(results[0], "demo.cif:8: _cell_volume 100.0 differs"));
}

TEST(CifReader, AnisotropicLoopIsNotMistakenForSites) {
  const std::string text = CubicBlock(
      "aniso", 5,
      "loop_\n_atom_site_label\n_atom_site_fract_x\n_atom_site_fract_y\n_atom_site_fract_z\n"
      "Na1 0 0 0\n"
      "loop_\n_atom_site_aniso_label\n_atom_site_aniso_U_11\nNa1 0.01\n");
  const auto results = ReadDemo(text);
  ASSERT_TRUE(results[0].crystal) << ErrorText(results[0]);
  EXPECT_EQ(results[0].crystal->size(), 1u);
}

}  // namespace
}  // namespace nucleate::structure::io
