// Extended XYZ: the conventions of libAtoms/QUIP extended XYZ as ASE reads and writes them
// (ase.io.extxyz); cross-reading with ASE itself is in tests/reference/io.
#include "core/structure/io/extxyz.h"

#include <string>

#include <gtest/gtest.h>

#include "core/common/error.h"
#include "core/structure/io/extxyz_comment.h"
#include "core/structure/lattice.h"
#include "tests/unit/io/io_test_support.h"

namespace nucleate::structure::io {
namespace {

using testing::HasSite;

std::string FrameError(const ExtxyzFrameResult& r) { return r.error ? r.error->what() : ""; }

const char* kTwoFrames =
    "2\n"
    "Lattice=\"4.0 0.0 0.0 0.0 4.0 0.0 0.0 0.0 4.0\" Properties=species:S:1:pos:R:3:forces:R:3:tag:I:1 "
    "energy=-10.5 config_type=bulk pbc=\"T T T\" name=\"two words\" stress=\"1 2 3 4 5 6 7 8 9\"\n"
    "Na 0.0 0.0 0.0   0.1 0.2 0.3  7\n"
    "Cl 2.0 2.0 2.0  -0.1 -0.2 -0.3 8\n"
    "1\n"
    "Properties=species:S:1:pos:R:3 Lattice=\"3 0 0 1 3 0 0 0 5\" free_energy = 2\n"
    "Cu 4.0 1.5 -2.5\n";

TEST(ExtxyzReader, ReadsFramesSkippingExtraColumnsByWidth) {
  const auto frames = ReadExtxyz(kTwoFrames, "t.xyz");
  ASSERT_EQ(frames.size(), 2u);
  ASSERT_TRUE(frames[0].crystal) << FrameError(frames[0]);
  const Crystal& a = *frames[0].crystal;
  EXPECT_EQ(a.numbers, (std::vector<int>{11, 17}));
  EXPECT_TRUE(HasSite(a.frac, {0.5, 0.5, 0.5}));
  EXPECT_EQ(a.label, "t.xyz#1");
  // Numeric scalars become properties; strings, logicals and arrays do not.
  ASSERT_EQ(a.properties.size(), 1u);
  EXPECT_DOUBLE_EQ(a.properties.at("energy"), -10.5);
  ASSERT_TRUE(frames[1].crystal) << FrameError(frames[1]);
  const Crystal& b = *frames[1].crystal;
  EXPECT_EQ(frames[1].line, 5);
  EXPECT_DOUBLE_EQ(b.properties.at("free_energy"), 2.0);
  // Cartesian (4, 1.5, -2.5) in rows a=(3,0,0), b=(1,3,0), c=(0,0,5): f = (7/6, 1/2, -1/2),
  // wrapped to (1/6, 1/2, 1/2).
  EXPECT_TRUE(HasSite(b.frac, {1.0 / 6, 0.5, 0.5}, 1e-12));
}

TEST(ExtxyzReader, ZColumnWhenNoSpecies) {
  const auto frames = ReadExtxyz("1\nLattice=\"2 0 0 0 2 0 0 0 2\" Properties=Z:I:1:pos:R:3\n26 0 0 0\n", "z.xyz");
  ASSERT_TRUE(frames[0].crystal) << FrameError(frames[0]);
  EXPECT_EQ(frames[0].crystal->numbers, std::vector<int>{26});
}

TEST(ExtxyzReader, BadFrameIsReportedAndReadingContinues) {
  const std::string text =
      "1\nLattice=\"4 0 0 0 4 0 0 0 4\"\nNa 0 0 0\n"
      "2\nLattice=\"4 0 0 0 4 0 0 0 4\"\nXx 0 0 0\nNa 1 1 1\n"
      "1\nLattice=\"4 0 0 0 4 0 0 0 4\"\nK 0 0 nan\n"
      "1\nLattice=\"4 0 0 0 4 0 0 0 4\"\nK 0 0\n"
      "1\nLattice=\"4 0 0 0 4 0 0 0 0\"\nK 0 0 0\n"
      "1\nLattice=\"4 0 0 0 4 0 0 0 4\" pbc=\"T T F\"\nK 0 0 0\n"
      "1\npbc=\"T T T\"\nK 0 0 0\n"
      "1\nLattice=\"4 0 0 0 4 0 0 0 4\" name=\"open\nK 0 0 0\n"
      "1\nLattice=\"5 0 0 0 5 0 0 0 5\"\nCl 0 0 0\n";
  const auto frames = ReadExtxyz(text, "bad.xyz");
  ASSERT_EQ(frames.size(), 9u);
  EXPECT_TRUE(frames[0].crystal);
  EXPECT_EQ(FrameError(frames[1]), "bad.xyz:6: unknown element symbol 'Xx' in species (frame 2)");
  EXPECT_EQ(FrameError(frames[2]), "bad.xyz:10: position 'nan' is not a finite number (frame 3)");
  EXPECT_EQ(FrameError(frames[3]),
            "bad.xyz:13: atom line has 3 columns; Properties declares 4 (frame 4)");
  EXPECT_EQ(FrameError(frames[4]), "bad.xyz:15: Lattice has zero volume (frame 5)");
  ASSERT_TRUE(frames[5].error);
  EXPECT_EQ(frames[5].error->kind(), ErrorKind::kUnsupported);
  EXPECT_EQ(FrameError(frames[6]),
            "bad.xyz:21: no Lattice=\"...\" on the comment line: a crystal needs its cell (frame 7)");
  EXPECT_EQ(FrameError(frames[7]),
            "bad.xyz:24: comment line: unterminated double-quoted string (frame 8)");
  ASSERT_TRUE(frames[8].crystal) << FrameError(frames[8]);
  EXPECT_EQ(frames[8].crystal->numbers, std::vector<int>{17});
}

TEST(ExtxyzReader, GarbledCountLineStops) {
  const auto frames = ReadExtxyz("1\nLattice=\"4 0 0 0 4 0 0 0 4\"\nNa 0 0 0\nabc\n1\n\nNa 0 0 0\n", "g.xyz");
  ASSERT_EQ(frames.size(), 2u);
  EXPECT_TRUE(frames[0].crystal);
  EXPECT_EQ(FrameError(frames[1]),
            "g.xyz:4: expected the number of atoms, found 'abc'; reading stops here (frame 2)");
}

TEST(ExtxyzReader, TruncatedFrame) {
  const auto frames = ReadExtxyz("3\nLattice=\"4 0 0 0 4 0 0 0 4\"\nNa 0 0 0\n", "t.xyz");
  ASSERT_EQ(frames.size(), 1u);
  EXPECT_EQ(FrameError(frames[0]), "t.xyz:3: file ends after 1 of 3 atom lines (truncated) (frame 1)");
}

TEST(ExtxyzReader, AtomCountAboveLimitIsSkippedWithoutAllocating) {
  ExtxyzReadOptions options;
  options.limits.max_atoms = 2;
  const std::string text =
      "3\nLattice=\"4 0 0 0 4 0 0 0 4\"\nNa 0 0 0\nNa 1 0 0\nNa 2 0 0\n"
      "1\nLattice=\"4 0 0 0 4 0 0 0 4\"\nK 0 0 0\n"
      "999999999999999999999999\nLattice=\"4 0 0 0 4 0 0 0 4\"\nK 0 0 0\n";
  const auto frames = ReadExtxyz(text, "l.xyz", options);
  ASSERT_EQ(frames.size(), 3u);
  ASSERT_TRUE(frames[0].error);
  EXPECT_EQ(frames[0].error->kind(), ErrorKind::kLimitExceeded);
  EXPECT_EQ(FrameError(frames[0]), "l.xyz:1: frame has 3 atoms, above the max_atoms limit of 2 (frame 1)");
  EXPECT_TRUE(frames[1].crystal);
  ASSERT_TRUE(frames[2].error);
  EXPECT_EQ(frames[2].error->kind(), ErrorKind::kLimitExceeded);
}

TEST(ExtxyzReader, CellAboveLimit) {
  const auto frames = ReadExtxyz("1\nLattice=\"4000 0 0 0 4 0 0 0 4\"\nNa 0 0 0\n", "c.xyz");
  ASSERT_TRUE(frames[0].error);
  EXPECT_EQ(frames[0].error->kind(), ErrorKind::kLimitExceeded);
  EXPECT_EQ(frames[0].error->field(), "c.xyz:2");
}

TEST(ExtxyzComment, QuotesEscapesArraysAndBareKeys) {
  std::string problem;
  const auto pairs = ParseExtxyzComment(
      R"(a=1 b="x \"y\" z" c={1 2 3} d=[4, 5] flag e = 2.5 "quoted key"=v)", problem);
  ASSERT_TRUE(pairs) << problem;
  ASSERT_EQ(pairs->size(), 7u);
  EXPECT_EQ((*pairs)[1].value, "x \"y\" z");
  EXPECT_EQ((*pairs)[2].value, "1 2 3");
  EXPECT_EQ((*pairs)[3].value, "4, 5");
  EXPECT_EQ((*pairs)[4].key, "flag");
  EXPECT_EQ((*pairs)[4].value, "T");
  EXPECT_EQ((*pairs)[5].key, "e");
  EXPECT_EQ((*pairs)[5].value, "2.5");
  EXPECT_EQ((*pairs)[6].key, "quoted key");
  EXPECT_FALSE(ParseExtxyzComment("a={1 2", problem));
  EXPECT_EQ(problem, "unterminated '{' array value");
}

TEST(ExtxyzWriter, MultiFrameRoundTrip) {
  Crystal a;
  LatticeParameters p;
  p.a = 5.1;
  p.b = 5.9;
  p.c = 7.7;
  p.alpha = 81;
  p.beta = 97;
  p.gamma = 113;
  a.lattice = MatrixFromParameters(p);
  a.numbers = {8, 26, 26};
  a.frac = {{0.1, 0.2, 0.3}, {0.5, 0.999999, 0.0}, {1.0 / 3, 2.0 / 3, 0.25}};
  a.label = "frame \"one\"";
  a.properties = {{"energy", -123.456789012345}, {"band_gap", 1.1}};
  Crystal b;
  b.lattice = Eigen::Matrix3d::Identity() * 3.0;
  b.numbers = {1};
  b.frac = {{0.5, 0.5, 0.5}};
  const std::string text = WriteExtxyz({a, b});
  const auto frames = ReadExtxyz(text, "rt.xyz");
  ASSERT_EQ(frames.size(), 2u);
  ASSERT_TRUE(frames[0].crystal) << FrameError(frames[0]);
  ASSERT_TRUE(frames[1].crystal) << FrameError(frames[1]);
  const Crystal& a2 = *frames[0].crystal;
  EXPECT_EQ(a2.lattice, a.lattice);  // shortest round-trip text: exact
  EXPECT_EQ(a2.numbers, a.numbers);
  EXPECT_EQ(a2.properties, a.properties);
  EXPECT_EQ(a2.label, a.label);
  for (std::size_t i = 0; i < a.size(); ++i) EXPECT_TRUE(HasSite(a2.frac, a.frac[i], 1e-12)) << i;
  EXPECT_EQ(frames[1].crystal->label, "rt.xyz#2");
  EXPECT_TRUE(HasSite(frames[1].crystal->frac, {0.5, 0.5, 0.5}, 1e-15));
}

TEST(ExtxyzWriter, RefusesWhatCannotBeWritten) {
  Crystal c;
  c.lattice = Eigen::Matrix3d::Identity() * 3.0;
  c.numbers = {1};
  c.frac = {{0, 0, 0}};
  c.properties = {{"two words", 1.0}};
  try {
    WriteExtxyz({c});
    ADD_FAILURE();
  } catch (const Error& e) {
    EXPECT_EQ(e.field(), "frames[0].properties['two words']");
  }
  c.properties = {{"Lattice", 1.0}};
  EXPECT_THROW(WriteExtxyzFrame(c), Error);
  c.properties = {{"e", std::nan("")}};
  EXPECT_THROW(WriteExtxyzFrame(c), Error);
  c.properties.clear();
  c.numbers = {0};
  EXPECT_THROW(WriteExtxyzFrame(c), Error);
}

}  // namespace
}  // namespace nucleate::structure::io
