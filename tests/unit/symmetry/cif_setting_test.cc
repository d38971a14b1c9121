// Every textbook structure written as a symmetrised CIF and read back expands to the same
// crystal: same space group (International Tables Vol. A, as in textbook_structures.cc), same
// composition and the same number of atoms in the conventional cell.
#include "core/symmetry/cif_setting.h"

#include <gtest/gtest.h>

#include "core/structure/composition.h"
#include "core/structure/io/cif_reader.h"
#include "textbook_structures.h"

namespace nucleate::symmetry {
namespace {

TEST(SymmetrisedCif, TextbookStructuresRoundTripThroughTheirAsymmetricUnit) {
  for (const testing::Textbook& textbook : testing::TextbookStructures()) {
    SCOPED_TRACE(textbook.name);
    const structure::io::SymmetrizedCrystal written = SymmetrisedForCif(textbook.crystal);
    EXPECT_EQ(written.space_group_number, textbook.number);
    const std::string cif = structure::io::WriteCifSymmetrized(written);
    const auto blocks = structure::io::ReadCif(cif, "written.cif");
    ASSERT_EQ(blocks.size(), 1u);
    ASSERT_TRUE(blocks[0].crystal.has_value()) << blocks[0].error->what() << "\n" << cif;
    const structure::Crystal& read = *blocks[0].crystal;
    const structure::Crystal conventional = Symmetrise(textbook.crystal);
    EXPECT_EQ(read.size(), conventional.size());
    EXPECT_EQ(structure::ReducedHillFormula(read.numbers),
              structure::ReducedHillFormula(textbook.crystal.numbers));
    EXPECT_EQ(AnalyseSymmetry(read).number, textbook.number);
  }
}

}  // namespace
}  // namespace nucleate::symmetry
