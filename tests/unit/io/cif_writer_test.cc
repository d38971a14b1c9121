// CIF writing: what is written (data names of the CIF core dictionary) and that nucleate's reader
// gets the same structure back. Cross-reading by pymatgen and ASE is in tests/reference/io.
#include "core/structure/io/cif_writer.h"

#include <string>

#include <gtest/gtest.h>

#include "core/common/error.h"
#include "core/structure/io/cif_reader.h"
#include "core/structure/lattice.h"
#include "tests/unit/io/io_test_support.h"

namespace nucleate::structure::io {
namespace {

using testing::ErrorText;
using testing::HasSite;

Crystal Monoclinic() {
  Crystal c;
  c.label = "mono test";
  LatticeParameters p;
  p.a = 5.123456789;
  p.b = 6.2;
  p.c = 7.3;
  p.alpha = 90;
  p.beta = 101.2345678;
  p.gamma = 90;
  c.lattice = MatrixFromParameters(p);
  c.numbers = {8, 14, 6, 1, 8};
  c.frac = {{0.1, 0.2, 0.3}, {0.123456789, 0.5, 0.9999999999}, {0.0, 0.0, 0.0},
            {0.75, 0.25, 0.5}, {0.33333333333, 0.66666666667, 0.1}};
  return c;
}

TEST(CifWriter, P1ContainsTheRequiredItems) {
  const std::string text = WriteCifP1(Monoclinic());
  for (const char* item :
       {"data_mono_test\n", "_symmetry_space_group_name_H-M   'P 1'\n", "_space_group_IT_number           1\n",
        "_cell_length_a    5.123457\n", "_cell_angle_beta  101.234568\n", "_cell_volume      ",
        "_chemical_formula_sum  'C H O2 Si'\n", " _atom_site_type_symbol\n", " _atom_site_label\n",
        " _atom_site_symmetry_multiplicity\n", " _atom_site_fract_x\n", " _atom_site_occupancy\n",
        "  1  'x, y, z'\n", "  Si  Si1  1  0.12345679  0.50000000  0.00000000  1\n",
        "  O  O2  1  0.33333333  0.66666667  0.10000000  1\n"}) {
    EXPECT_NE(text.find(item), std::string::npos) << "missing " << item << " in\n" << text;
  }
}

TEST(CifWriter, P1RoundTripsThroughTheReader) {
  const Crystal original = Monoclinic();
  const auto results = ReadCif(WriteCifP1(original), "w.cif");
  ASSERT_EQ(results.size(), 1u);
  ASSERT_TRUE(results[0].crystal) << ErrorText(results[0]);
  EXPECT_TRUE(results[0].warnings.empty());
  const Crystal& back = *results[0].crystal;
  EXPECT_EQ(back.label, "mono_test");
  EXPECT_EQ(back.numbers, original.numbers);
  // 6 decimals for the cell, 8 for coordinates: the precision written.
  const LatticeParameters a = ParametersFromMatrix(original.lattice);
  const LatticeParameters b = ParametersFromMatrix(back.lattice);
  EXPECT_NEAR(a.a, b.a, 5e-7);
  EXPECT_NEAR(a.beta, b.beta, 5e-7);
  EXPECT_NEAR(SignedVolume(original.lattice), SignedVolume(back.lattice), 1e-5);
  for (std::size_t i = 0; i < original.size(); ++i) {
    EXPECT_TRUE(HasSite(back.frac, original.frac[i], 5.1e-9)) << i;
  }
}

TEST(CifWriter, LeftHandedLatticeKeepsTheSameAtoms) {
  Crystal c = Monoclinic();
  c.lattice.row(2) *= -1.0;  // left-handed; each site's Cartesian position changes with it
  const auto results = ReadCif(WriteCifP1(c), "w.cif");
  ASSERT_TRUE(results[0].crystal) << ErrorText(results[0]);
  const Crystal& back = *results[0].crystal;
  // Same structure: same interatomic vectors up to a rotation, so compare sorted distances of
  // site 0 to the others (minimum image over a 3x3x3 block is enough for these coordinates).
  const auto distances = [](const Crystal& x) {
    std::vector<double> d;
    for (std::size_t j = 1; j < x.size(); ++j) {
      double best = 1e9;
      for (int i = -1; i <= 1; ++i)
        for (int k = -1; k <= 1; ++k)
          for (int l = -1; l <= 1; ++l) {
            const Eigen::Vector3d f = x.frac[j] - x.frac[0] + Eigen::Vector3d(i, k, l);
            best = std::min(best, (x.lattice.transpose() * f).norm());
          }
      d.push_back(best);
    }
    std::sort(d.begin(), d.end());
    return d;
  };
  const std::vector<double> expected = distances(c), got = distances(back);
  ASSERT_EQ(expected.size(), got.size());
  for (std::size_t i = 0; i < got.size(); ++i) EXPECT_NEAR(got[i], expected[i], 1e-5);
  EXPECT_GT(SignedVolume(back.lattice), 0);
}

SymmetrizedCrystal RockSaltSymmetrized() {
  // Fm-3m, Na on 4a (0,0,0), Cl on 4b (1/2,1/2,1/2) (International Tables A, group 225; from
  // memory). Operations built as in the reader test: 48 signed permutations x 4 centrings.
  SymmetrizedCrystal s;
  s.label = "NaCl";
  s.lattice = Eigen::Matrix3d::Identity() * 5.64;
  s.space_group_number = 225;
  s.hm_symbol = "F m -3 m";
  const int perms[6][3] = {{0, 1, 2}, {0, 2, 1}, {1, 0, 2}, {1, 2, 0}, {2, 0, 1}, {2, 1, 0}};
  const Eigen::Vector3d centring[4] = {{0, 0, 0}, {0, 0.5, 0.5}, {0.5, 0, 0.5}, {0.5, 0.5, 0}};
  for (const Eigen::Vector3d& t : centring) {
    for (const auto& p : perms) {
      for (int signs = 0; signs < 8; ++signs) {
        SymmetryOperation op;
        op.rotation.setZero();
        for (int k = 0; k < 3; ++k) op.rotation(k, p[k]) = ((signs >> k) & 1) ? -1 : 1;
        op.translation = t;
        s.operations.push_back(op);
      }
    }
  }
  s.sites = {{"Na1", 11, {0, 0, 0}, 4, "a"}, {"Cl1", 17, {0.5, 0.5, 0.5}, 4, "b"}};
  return s;
}

TEST(CifWriter, SymmetrizedRockSaltReadsBackAsEightAtoms) {
  const std::string text = WriteCifSymmetrized(RockSaltSymmetrized());
  EXPECT_NE(text.find("_symmetry_space_group_name_H-M   'F m -3 m'\n"), std::string::npos);
  EXPECT_NE(text.find("_space_group_IT_number           225\n"), std::string::npos);
  EXPECT_NE(text.find("_chemical_formula_sum  'Cl4 Na4'\n"), std::string::npos);
  EXPECT_NE(text.find(" _atom_site_Wyckoff_symbol\n"), std::string::npos);
  EXPECT_NE(text.find("  Na  Na1  4  a  0.00000000  0.00000000  0.00000000  1\n"), std::string::npos)
      << text;
  EXPECT_NE(text.find("  192  '-z+1/2, -y+1/2, -x'\n"), std::string::npos) << text;
  const auto results = ReadCif(text, "nacl.cif");
  ASSERT_TRUE(results[0].crystal) << ErrorText(results[0]);
  EXPECT_EQ(results[0].space_group_number, 225);
  EXPECT_EQ(results[0].space_group_name, "F m -3 m");
  EXPECT_EQ(results[0].crystal->size(), 8u);
  EXPECT_TRUE(HasSite(results[0].crystal->frac, {0.5, 0, 0}));
}

TEST(CifWriter, SymmetrizedInputIsChecked) {
  const auto field_of = [](const SymmetrizedCrystal& s) {
    try {
      WriteCifSymmetrized(s);
    } catch (const Error& e) {
      EXPECT_EQ(e.kind(), ErrorKind::kInvalidArgument);
      return e.field();
    }
    return std::string("no error");
  };
  SymmetrizedCrystal s = RockSaltSymmetrized();
  s.space_group_number = 231;
  EXPECT_EQ(field_of(s), "space_group_number");
  s = RockSaltSymmetrized();
  s.operations.erase(s.operations.begin());  // the identity
  EXPECT_EQ(field_of(s), "operations");
  s = RockSaltSymmetrized();
  s.sites[1].label = "Na1";
  EXPECT_EQ(field_of(s), "sites[1].label");
  s = RockSaltSymmetrized();
  s.sites[0].label = "Na 1";
  EXPECT_EQ(field_of(s), "sites[0].label");
  s = RockSaltSymmetrized();
  s.sites[0].number = 0;
  EXPECT_EQ(field_of(s), "sites[0].number");
  s = RockSaltSymmetrized();
  s.sites[0].multiplicity = 0;
  EXPECT_EQ(field_of(s), "sites[0].multiplicity");
  s = RockSaltSymmetrized();
  s.sites[0].frac[0] = std::nan("");
  EXPECT_EQ(field_of(s), "sites[0].frac");
  s = RockSaltSymmetrized();
  s.lattice(0, 0) = std::nan("");
  EXPECT_EQ(field_of(s), "lattice");
}

TEST(CifWriter, P1InputIsChecked) {
  Crystal c = Monoclinic();
  c.numbers[2] = 119;
  EXPECT_THROW(WriteCifP1(c), Error);
  c = Monoclinic();
  c.frac.pop_back();
  EXPECT_THROW(WriteCifP1(c), Error);
  c = Monoclinic();
  c.lattice.row(2) = c.lattice.row(0);
  EXPECT_THROW(WriteCifP1(c), Error);
}


}  // namespace
}  // namespace nucleate::structure::io
