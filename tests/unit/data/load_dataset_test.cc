#include "core/train/data/load_dataset.h"

#include <algorithm>
#include <cmath>
#include <filesystem>
#include <functional>
#include <sstream>
#include <string>
#include <vector>

#include <gtest/gtest.h>

#include "core/common/error.h"
#include "nucleate/v1/dataset.pb.h"
#include "tests/unit/data/data_test_support.h"

namespace nucleate::train::data {
namespace {

using testing::ScratchFolder;

// Textbook structures, all values from memory (handbook values of common crystals):
//   NaCl rock salt, Fm-3m (225), a = 5.64 A;
//   Si diamond, Fd-3m (227), a = 5.431 A;
//   CsCl, Pm-3m (221), a = 4.123 A;
//   W body-centred cubic, Im-3m (229), a = 3.165 A;
//   TiO2 rutile, P4_2/mnm (136), a = 4.594 A, c = 2.959 A, O at (x, x, 0) with x = 0.305.
// Space-group numbers: International Tables for Crystallography Vol. A (from memory).
constexpr double kNaClA = 5.64;
constexpr double kSiA = 5.431;

std::string CubicCifP1(const std::string& block, double a, const std::string& sites) {
  std::ostringstream out;
  out << "data_" << block << "\n"
      << "_cell_length_a " << a << "\n_cell_length_b " << a << "\n_cell_length_c " << a << "\n"
      << "_cell_angle_alpha 90\n_cell_angle_beta 90\n_cell_angle_gamma 90\n"
      << "_symmetry_space_group_name_H-M 'P 1'\n"
      << "loop_\n_symmetry_equiv_pos_as_xyz\n'x, y, z'\n"
      << "loop_\n_atom_site_label\n_atom_site_type_symbol\n"
      << "_atom_site_fract_x\n_atom_site_fract_y\n_atom_site_fract_z\n"
      << sites;
  return out.str();
}

const char kNaClSites[] =
    "Na1 Na 0 0 0\nNa2 Na 0 0.5 0.5\nNa3 Na 0.5 0 0.5\nNa4 Na 0.5 0.5 0\n"
    "Cl1 Cl 0.5 0 0\nCl2 Cl 0.5 0.5 0.5\nCl3 Cl 0 0 0.5\nCl4 Cl 0 0.5 0\n";

const char kRutileCif[] =
    "data_rutile\n"
    "_cell_length_a 4.594\n_cell_length_b 4.594\n_cell_length_c 2.959\n"
    "_cell_angle_alpha 90\n_cell_angle_beta 90\n_cell_angle_gamma 90\n"
    "_symmetry_space_group_name_H-M 'P 1'\n"
    "loop_\n_symmetry_equiv_pos_as_xyz\n'x, y, z'\n"
    "loop_\n_atom_site_label\n_atom_site_type_symbol\n"
    "_atom_site_fract_x\n_atom_site_fract_y\n_atom_site_fract_z\n"
    "Ti1 Ti 0 0 0\nTi2 Ti 0.5 0.5 0.5\n"
    "O1 O 0.305 0.305 0\nO2 O 0.695 0.695 0\nO3 O 0.805 0.195 0.5\nO4 O 0.195 0.805 0.5\n";

// Cu3Au-type site with half occupancy: disorder, which the reader refuses.
const char kPartialCif[] =
    "data_disordered\n"
    "_cell_length_a 3.75\n_cell_length_b 3.75\n_cell_length_c 3.75\n"
    "_cell_angle_alpha 90\n_cell_angle_beta 90\n_cell_angle_gamma 90\n"
    "_symmetry_space_group_name_H-M 'P 1'\n"
    "loop_\n_symmetry_equiv_pos_as_xyz\n'x, y, z'\n"
    "loop_\n_atom_site_label\n_atom_site_type_symbol\n"
    "_atom_site_fract_x\n_atom_site_fract_y\n_atom_site_fract_z\n_atom_site_occupancy\n"
    "Cu1 Cu 0 0 0 0.5\nAu1 Au 0.5 0.5 0 1\n";

// Diamond Si in the basis a, b, a + b + c of the cubic cell (same lattice, same volume).
std::string SkewedSiliconXyz() {
  const double f[8][3] = {{0, 0, 0},          {0, 0.5, 0.5},      {0.5, 0, 0.5},
                          {0.5, 0.5, 0},      {0.25, 0.25, 0.25}, {0.25, 0.75, 0.75},
                          {0.75, 0.25, 0.75}, {0.75, 0.75, 0.25}};
  std::ostringstream out;
  out.precision(17);
  out << "8\nLattice=\"" << kSiA << " 0 0 0 " << kSiA << " 0 " << kSiA << " " << kSiA << " "
      << kSiA << "\" Properties=species:S:1:pos:R:3 pbc=\"T T T\"\n";
  for (const auto& p : f) {
    out << "Si " << p[0] * kSiA << " " << p[1] * kSiA << " " << p[2] * kSiA << "\n";
  }
  return out.str();
}

const char kFramesXyz[] =
    "2\nLattice=\"4.123 0 0 0 4.123 0 0 0 4.123\" Properties=species:S:1:pos:R:3 "
    "formation_energy=9.0\nCs 0 0 0\nCl 2.0615 2.0615 2.0615\n"
    "2\nLattice=\"3.165 0 0 0 3.165 0 0 0 3.165\" Properties=species:S:1:pos:R:3 "
    "formation_energy=0.25\nW 0 0 0\nW 1.5825 1.5825 1.5825\n";

// The property numbers are arbitrary test data, not physical values.
const char kPropertiesCsv[] =
    "file,band_gap,formation_energy\n"
    "NaCl.cif,5.0,-2.0\n"
    "Si_skewed.xyz,1.1,\n"
    "frames.extxyz@1,0.0,-1.0\n"
    "frames.extxyz@2,abc,\n"
    "missing.cif,1.0,1.0\n"
    "rutile.cif,3.0,-3.0\n";

void WriteFixture(const ScratchFolder& folder, const std::string& csv = kPropertiesCsv) {
  folder.Write("NaCl.cif", CubicCifP1("NaCl", kNaClA, kNaClSites));
  folder.Write("rutile.cif", kRutileCif);
  folder.Write("partial.cif", kPartialCif);
  folder.Write("broken.cif", "this file is not a CIF at all\n");
  folder.Write("Si_skewed.xyz", SkewedSiliconXyz());
  folder.Write("frames.extxyz", kFramesXyz);
  folder.Write("notes.txt", "not a structure file: ignored\n");
  folder.Write("properties.csv", csv);
}

DataSource FixtureSource(const ScratchFolder& folder) {
  DataSource source;
  source.directory = folder.path();
  source.properties_csv = folder.path() + "/properties.csv";
  source.property_names = {"band_gap", "formation_energy"};
  return source;
}

std::vector<std::string> Sources(const Dataset& d) {
  std::vector<std::string> out;
  for (const TrainingExample& e : d.examples) out.push_back(e.source);
  return out;
}

// The problems whose source starts with `prefix`.
std::vector<DatasetProblem> ProblemsOf(const DatasetReport& report, const std::string& prefix) {
  std::vector<DatasetProblem> out;
  for (const DatasetProblem& p : report.problems) {
    if (p.source.rfind(prefix, 0) == 0) out.push_back(p);
  }
  return out;
}

bool Contains(const std::string& text, const std::string& part) {
  return text.find(part) != std::string::npos;
}

std::pair<ErrorKind, std::string> ErrorOf(const std::function<void()>& f) {
  try {
    f();
  } catch (const Error& e) {
    return {e.kind(), e.field() + " | " + e.detail()};
  }
  return {ErrorKind::kInternal, "(no error)"};
}

TEST(LoadDataset, CountsKeepsAndSkipsTheFixtureFiles) {
  ScratchFolder folder;
  WriteFixture(folder);
  const Dataset d = LoadDataset(FixtureSource(folder));
  const DatasetReport& r = d.report;
  // Byte order of names: upper case first. notes.txt and properties.csv are not structure files.
  EXPECT_EQ(Sources(d), (std::vector<std::string>{"NaCl.cif#NaCl", "Si_skewed.xyz@1",
                                                  "frames.extxyz@1", "frames.extxyz@2",
                                                  "rutile.cif#rutile"}));
  EXPECT_EQ(r.files_read, 6);
  EXPECT_EQ(r.files_skipped, 0);
  EXPECT_EQ(r.files_ignored, 2);
  EXPECT_EQ(r.structures_kept, 5);
  EXPECT_EQ(r.structures_skipped, 2);
  EXPECT_EQ(r.property_values_rejected, 1);
  EXPECT_EQ(r.property_rows_rejected, 1);
  EXPECT_EQ(r.problems.size(), 4u);
  EXPECT_EQ(r.problems_not_listed, 0);

  const auto broken = ProblemsOf(r, "broken.cif");
  ASSERT_EQ(broken.size(), 1u);
  EXPECT_TRUE(Contains(broken[0].reason, "broken.cif")) << broken[0].reason;
  const auto partial = ProblemsOf(r, "partial.cif");
  ASSERT_EQ(partial.size(), 1u);
  EXPECT_TRUE(Contains(partial[0].reason, "partial occupancy")) << partial[0].reason;
  const auto csv = ProblemsOf(r, "properties.csv:");
  ASSERT_EQ(csv.size(), 2u);
  EXPECT_EQ(csv[0].source, "properties.csv:5");
  EXPECT_TRUE(Contains(csv[0].reason, "'abc' is not a number")) << csv[0].reason;
  EXPECT_TRUE(Contains(csv[0].reason, "frames.extxyz@2")) << csv[0].reason;
  EXPECT_EQ(csv[1].source, "properties.csv:6");
  EXPECT_TRUE(Contains(csv[1].reason, "missing.cif")) << csv[1].reason;
}

TEST(LoadDataset, LabelsFormulaSymmetryAndProperties) {
  ScratchFolder folder;
  WriteFixture(folder);
  const Dataset d = LoadDataset(FixtureSource(folder));
  ASSERT_EQ(d.examples.size(), 5u);
  const std::vector<std::string> formulas = {"ClNa", "Si", "ClCs", "W", "O2Ti"};
  const std::vector<int> groups = {225, 227, 221, 229, 136};
  const std::vector<int> systems = {7, 7, 7, 7, 4};  // cubic = 7, tetragonal = 4
  const double nan = std::nan("");
  // CSV first; a structure's own value (extended XYZ key=value) where the CSV cell is empty;
  // the rejected "abc" stays missing.
  const std::vector<std::vector<double>> properties = {
      {5.0, -2.0}, {1.1, nan}, {0.0, -1.0}, {nan, 0.25}, {3.0, -3.0}};
  for (std::size_t i = 0; i < d.examples.size(); ++i) {
    const TrainingExample& e = d.examples[i];
    EXPECT_EQ(e.formula, formulas[i]) << e.source;
    EXPECT_EQ(e.space_group, groups[i]) << e.source;
    EXPECT_EQ(e.crystal_system, systems[i]) << e.source;
    EXPECT_EQ(e.crystal.label, e.source);
    ASSERT_EQ(e.properties.size(), 2u);
    for (int k = 0; k < 2; ++k) {
      if (std::isnan(properties[i][k])) {
        EXPECT_TRUE(std::isnan(e.properties[k])) << e.source << " property " << k;
      } else {
        EXPECT_EQ(e.properties[k], properties[i][k]) << e.source << " property " << k;
      }
    }
    for (const Eigen::Vector3d& f : e.crystal.frac) {
      EXPECT_TRUE((f.array() >= 0.0).all() && (f.array() < 1.0).all()) << e.source;
    }
  }
}

// spglib's Niggli reduction reduces the basis of the lattice it is given; it does not look for a
// primitive cell of the atoms. So the skewed basis (a, b, a + b + c) of Si's cubic cell comes back
// as the cubic cell (Niggli's conditions for a cubic lattice: the three shortest vectors, all at
// 90 degrees; International Tables Vol. A, section 9.2, from memory), still 8 atoms, and the
// conventional 8-atom NaCl cell keeps its volume a^3 instead of shrinking to the primitive a^3/4.
TEST(LoadDataset, NiggliReducesTheBasisButKeepsTheCell) {
  ScratchFolder folder;
  WriteFixture(folder);
  const Dataset d = LoadDataset(FixtureSource(folder));
  ASSERT_EQ(d.examples.size(), 5u);
  const structure::Crystal& si = d.examples[1].crystal;
  ASSERT_EQ(si.size(), 8u);
  for (int r = 0; r < 3; ++r) EXPECT_NEAR(si.lattice.row(r).norm(), kSiA, 1e-9);
  EXPECT_NEAR(std::abs(si.lattice.row(0).dot(si.lattice.row(1))), 0.0, 1e-9);
  EXPECT_NEAR(std::abs(si.lattice.row(0).dot(si.lattice.row(2))), 0.0, 1e-9);
  EXPECT_NEAR(std::abs(si.lattice.row(1).dot(si.lattice.row(2))), 0.0, 1e-9);
  EXPECT_NEAR(std::abs(si.lattice.determinant()), kSiA * kSiA * kSiA, 1e-9);
  const structure::Crystal& nacl = d.examples[0].crystal;
  EXPECT_EQ(nacl.size(), 8u);
  EXPECT_NEAR(std::abs(nacl.lattice.determinant()), kNaClA * kNaClA * kNaClA, 1e-9);
}

TEST(LoadDataset, ReportsProgressPerFileAndStopsWhenAsked) {
  ScratchFolder folder;
  WriteFixture(folder);
  std::vector<LoadProgress> seen;
  LoadDataset(FixtureSource(folder), [&seen](const LoadProgress& p) {
    seen.push_back(p);
    return true;
  });
  ASSERT_EQ(seen.size(), 6u);
  EXPECT_EQ(seen.back().files_done, 6);
  EXPECT_EQ(seen.back().files_total, 6);
  EXPECT_EQ(seen.back().structures_kept, 5);
  const auto stop = [](const LoadProgress&) { return false; };
  const auto stopped = ErrorOf([&] { LoadDataset(FixtureSource(folder), stop); });
  EXPECT_EQ(stopped.first, ErrorKind::kCancelled);
}

TEST(LoadDataset, TooManyAtomsIsAProblemNotAFailure) {
  ScratchFolder folder;
  WriteFixture(folder);
  DataSource source = FixtureSource(folder);
  source.limits.max_atoms = 7;  // NaCl and Si cells hold 8
  const Dataset d = LoadDataset(source);
  EXPECT_EQ(Sources(d), (std::vector<std::string>{"frames.extxyz@1", "frames.extxyz@2",
                                                  "rutile.cif#rutile"}));
  EXPECT_EQ(d.report.structures_skipped, 4);
  EXPECT_EQ(ProblemsOf(d.report, "NaCl.cif").size(), 1u);
  EXPECT_EQ(ProblemsOf(d.report, "Si_skewed.xyz").size(), 1u);
}

TEST(LoadDataset, OversizedFilesAreSkippedByName) {
  ScratchFolder folder;
  WriteFixture(folder);
  folder.Write("huge.cif", std::string(4000, '#'));
  DataSource source = FixtureSource(folder);
  source.max_file_bytes = 3000;  // every fixture file is smaller, huge.cif is not
  const Dataset d = LoadDataset(source);
  EXPECT_EQ(d.report.files_skipped, 1);
  EXPECT_EQ(d.report.files_read, 6);
  const auto huge = ProblemsOf(d.report, "huge.cif");
  ASSERT_EQ(huge.size(), 1u);
  EXPECT_TRUE(Contains(huge[0].reason, "4000 bytes")) << huge[0].reason;
}

TEST(LoadDataset, FoldersAndBrokenLinksWithStructureNamesAreProblems) {
  ScratchFolder folder;
  WriteFixture(folder);
  std::filesystem::create_directory(folder.path() + "/old.cif");
  std::filesystem::create_symlink(folder.path() + "/gone.cif", folder.path() + "/link.xyz");
  std::filesystem::create_directory(folder.path() + "/subfolder");
  const Dataset d = LoadDataset(FixtureSource(folder));
  EXPECT_EQ(d.report.files_skipped, 2);
  EXPECT_EQ(d.report.files_ignored, 3);  // notes.txt, properties.csv, subfolder
  EXPECT_EQ(ProblemsOf(d.report, "old.cif").size(), 1u);
  EXPECT_EQ(ProblemsOf(d.report, "link.xyz").size(), 1u);
  EXPECT_EQ(d.report.structures_kept, 5);
}

TEST(LoadDataset, CsvRowsThatNameSeveralStructuresOrRepeatAreRejected) {
  ScratchFolder folder;
  WriteFixture(folder,
               "file,band_gap\n"
               "frames.extxyz,1.0\n"          // two structures: ambiguous
               "NaCl.cif,2.0\n"
               "NaCl.cif#NaCl,3.0\n"          // the same structure by its source: a repeat
               "\"rutile.cif\",\" 4.5 \"\n"   // quoted fields
               "partial.cif,1.0\n");         // a skipped structure: no further problem
  DataSource source = FixtureSource(folder);
  source.property_names = {"band_gap"};
  const Dataset d = LoadDataset(source);
  EXPECT_EQ(d.report.property_rows_rejected, 2);
  const auto csv = ProblemsOf(d.report, "properties.csv:");
  ASSERT_EQ(csv.size(), 2u);
  EXPECT_EQ(csv[0].source, "properties.csv:2");
  EXPECT_TRUE(Contains(csv[0].reason, "names 2 structures")) << csv[0].reason;
  EXPECT_EQ(csv[1].source, "properties.csv:4");
  EXPECT_TRUE(Contains(csv[1].reason, "the first is line 3")) << csv[1].reason;
  EXPECT_EQ(d.examples[0].properties[0], 2.0);
  EXPECT_EQ(d.examples.back().properties[0], 4.5);
}

TEST(LoadDataset, WholeSourceErrorsNameTheirField) {
  ScratchFolder folder;
  DataSource source;
  source.directory = folder.path();
  auto error = ErrorOf([&] { LoadDataset(source); });
  EXPECT_EQ(error.first, ErrorKind::kInvalidArgument);
  EXPECT_TRUE(Contains(error.second, "directory |")) << error.second;
  EXPECT_TRUE(Contains(error.second, "no usable structure")) << error.second;

  folder.Write("broken.cif", "this file is not a CIF at all\n");
  error = ErrorOf([&] { LoadDataset(source); });
  EXPECT_EQ(error.first, ErrorKind::kInvalidArgument);
  EXPECT_TRUE(Contains(error.second, "broken.cif")) << error.second;

  source.directory = folder.path() + "/does_not_exist";
  EXPECT_EQ(ErrorOf([&] { LoadDataset(source); }).first, ErrorKind::kIo);

  source.structure_set_file = "x.pb";
  error = ErrorOf([&] { LoadDataset(source); });
  EXPECT_TRUE(Contains(error.second, "exactly one of")) << error.second;

  ScratchFolder full;
  WriteFixture(full);
  DataSource limited = FixtureSource(full);
  limited.max_structures = 3;
  error = ErrorOf([&] { LoadDataset(limited); });
  EXPECT_EQ(error.first, ErrorKind::kLimitExceeded);
  EXPECT_TRUE(Contains(error.second, "max_structures |")) << error.second;

  DataSource misspelt = FixtureSource(full);
  misspelt.property_names = {"band_gpa"};
  error = ErrorOf([&] { LoadDataset(misspelt); });
  EXPECT_TRUE(Contains(error.second, "property_names[0] |")) << error.second;

  DataSource twice = FixtureSource(full);
  twice.property_names = {"band_gap", "band_gap"};
  error = ErrorOf([&] { LoadDataset(twice); });
  EXPECT_TRUE(Contains(error.second, "property_names[1] |")) << error.second;
}

TEST(LoadDataset, ReadsAStructureSetFile) {
  ScratchFolder folder;
  v1::StructureSet set;
  v1::Structure* nacl = set.add_structures();
  for (int k = 0; k < 9; ++k) nacl->add_lattice(k % 4 == 0 ? kNaClA : 0.0);
  const double sites[8][3] = {{0, 0, 0},   {0, 0.5, 0.5},   {0.5, 0, 0.5}, {0.5, 0.5, 0},
                              {0.5, 0, 0}, {0.5, 0.5, 0.5}, {0, 0, 0.5},   {0, 0.5, 0}};
  for (int i = 0; i < 8; ++i) {
    nacl->add_atomic_numbers(i < 4 ? 11 : 17);
    for (double x : sites[i]) nacl->add_frac_coords(x);
  }
  nacl->set_label("rock salt");
  (*nacl->mutable_properties())["band_gap"] = 5.0;
  v1::Structure* bad = set.add_structures();
  for (int k = 0; k < 8; ++k) bad->add_lattice(1.0);  // one number short
  bad->set_label("short lattice");
  v1::Structure* tungsten = set.add_structures();
  for (int k = 0; k < 9; ++k) tungsten->add_lattice(k % 4 == 0 ? 3.165 : 0.0);
  for (double x : {0.0, 0.0, 0.0, 0.5, 0.5, 0.5}) tungsten->add_frac_coords(x);
  tungsten->add_atomic_numbers(74);
  tungsten->add_atomic_numbers(74);
  std::string bytes;
  ASSERT_TRUE(set.SerializeToString(&bytes));
  DataSource source;
  source.structure_set_file = folder.Write("set.pb", bytes);
  source.property_names = {"band_gap"};
  const Dataset d = LoadDataset(source);
  EXPECT_EQ(Sources(d), (std::vector<std::string>{"rock salt", "structures[2]"}));
  EXPECT_EQ(d.report.files_read, 1);
  EXPECT_EQ(d.report.structures_kept, 2);
  EXPECT_EQ(d.report.structures_skipped, 1);
  ASSERT_EQ(d.report.problems.size(), 1u);
  EXPECT_EQ(d.report.problems[0].source, "short lattice");
  EXPECT_TRUE(Contains(d.report.problems[0].reason, "structures[1].lattice"))
      << d.report.problems[0].reason;
  EXPECT_EQ(d.examples[0].properties[0], 5.0);
  EXPECT_TRUE(std::isnan(d.examples[1].properties[0]));
  EXPECT_EQ(d.examples[0].space_group, 225);
  EXPECT_EQ(d.examples[1].space_group, 229);

  source.structure_set_file = folder.Write("garbage.pb", "\xff\xff\xff\xff not protobuf");
  const auto error = ErrorOf([&] { LoadDataset(source); });
  EXPECT_EQ(error.first, ErrorKind::kInvalidArgument);
  EXPECT_TRUE(Contains(error.second, "structure_set_file |")) << error.second;
}

}  // namespace
}  // namespace nucleate::train::data
