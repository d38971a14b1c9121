// Robustness: every prefix of a valid file (a file cut anywhere) and many byte-level corruptions
// read without a crash or an exception, and every block or frame ends as exactly one of
// structure or error. Run under -DNUCLEATE_SANITIZE=ON this also checks memory safety.
#include <cstdint>
#include <string>

#include <gtest/gtest.h>

#include "core/structure/io/cif_reader.h"
#include "core/structure/io/cif_writer.h"
#include "core/structure/io/extxyz.h"
#include "tests/unit/io/io_test_support.h"

namespace nucleate::structure::io {
namespace {

std::string SampleCif() {
  return testing::CubicBlock(
             "one", 5.64,
             "_space_group_name_H-M_alt 'F m -3 m'\n_journal_title\n;multi\nline\n;\n"
             "loop_\n_space_group_symop_operation_xyz\n'x, y, z'\n'-x, y+1/2, z+1/2'\n"
             "'x+1/2, -y, z+1/2'\n'x+1/2, y+1/2, -z'\n"
             "loop_\n_atom_site_label\n_atom_site_type_symbol\n_atom_site_fract_x\n"
             "_atom_site_fract_y\n_atom_site_fract_z\n_atom_site_occupancy\n"
             "Na1 Na 0 0 0 1\n\"Cl 1\" Cl 0.5(1) 0.5 0.5 1.0\n") +
         testing::CubicBlock("two", 4.0,
                             "_atom_site_label Cu1\n_atom_site_fract_x 0\n_atom_site_fract_y 0\n"
                             "_atom_site_fract_z 0\n");
}

void ExpectWellFormed(const std::vector<CifBlockResult>& results, const std::string& context) {
  ASSERT_FALSE(results.empty()) << context;
  for (const CifBlockResult& r : results) {
    EXPECT_NE(r.crystal.has_value(), r.error.has_value()) << context;
    if (r.crystal) {
      EXPECT_LE(r.crystal->size(), 16u) << context;  // 8 operations x 2 sites at most
    }
  }
}

TEST(GarbledInput, CifCutAtEveryByte) {
  const std::string text = SampleCif();
  ASSERT_TRUE(ReadCif(text, "full.cif")[0].crystal);
  for (std::size_t n = 0; n <= text.size(); ++n) {
    std::vector<CifBlockResult> results;
    EXPECT_NO_THROW(results = ReadCif(text.substr(0, n), "cut.cif")) << n;
    ExpectWellFormed(results, "cut at " + std::to_string(n));
  }
}

TEST(GarbledInput, CifWithCorruptedBytes) {
  const std::string text = SampleCif();
  std::uint64_t state = 12345;
  const auto next = [&state]() {  // a fixed linear congruential sequence: reproducible
    state = state * 6364136223846793005ULL + 1442695040888963407ULL;
    return static_cast<std::uint32_t>(state >> 33);
  };
  const std::string alphabet = "'\";#_ \n\t.?()x,+-/0123456789eE\x01\xff";
  for (int trial = 0; trial < 3000; ++trial) {
    std::string garbled = text;
    const int edits = 1 + next() % 4;
    for (int e = 0; e < edits; ++e) {
      garbled[next() % garbled.size()] = alphabet[next() % alphabet.size()];
    }
    std::vector<CifBlockResult> results;
    EXPECT_NO_THROW(results = ReadCif(garbled, "garbled.cif")) << trial;
    ExpectWellFormed(results, "trial " + std::to_string(trial));
  }
}

TEST(GarbledInput, ExtxyzCutAtEveryByte) {
  Crystal a;
  a.lattice = Eigen::Matrix3d::Identity() * 4.0;
  a.numbers = {11, 17};
  a.frac = {{0, 0, 0}, {0.5, 0.5, 0.5}};
  a.properties = {{"energy", -1.5}};
  a.label = "first";
  Crystal b = a;
  b.label = "second";
  const std::string text = WriteExtxyz({a, b});
  for (std::size_t n = 0; n <= text.size(); ++n) {
    std::vector<ExtxyzFrameResult> frames;
    EXPECT_NO_THROW(frames = ReadExtxyz(text.substr(0, n), "cut.xyz")) << n;
    EXPECT_LE(frames.size(), 2u);
    for (const ExtxyzFrameResult& f : frames) {
      EXPECT_NE(f.crystal.has_value(), f.error.has_value()) << n;
    }
  }
}

}  // namespace
}  // namespace nucleate::structure::io
