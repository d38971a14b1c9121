#include "core/elements/elements.h"

#include <cmath>
#include <set>
#include <string>

#include <gtest/gtest.h>

namespace nucleate::elements {
namespace {

TEST(Elements, AllOneHundredEighteenInOrderWithUniqueSymbols) {
  std::set<std::string> symbols;
  for (int z = 1; z <= kMaxAtomicNumber; ++z) {
    const Element* e = FindElement(z);
    ASSERT_NE(e, nullptr) << z;
    EXPECT_EQ(e->number, z);
    EXPECT_TRUE(symbols.insert(e->symbol).second) << e->symbol;
    EXPECT_EQ(AtomicNumber(e->symbol), z);
    EXPECT_GT(e->atomic_weight, 0.9 * z) << e->symbol;  // A >= Z for every nuclide but 1H
    EXPECT_FALSE(std::string(e->name).empty());
    // States are sorted, non-zero and distinct.
    for (std::size_t k = 0; k < e->common_oxidation_states.size(); ++k) {
      EXPECT_NE(e->common_oxidation_states[k], 0) << e->symbol;
      if (k > 0) EXPECT_LT(e->common_oxidation_states[k - 1], e->common_oxidation_states[k]);
    }
  }
  EXPECT_EQ(FindElement(0), nullptr);
  EXPECT_EQ(FindElement(119), nullptr);
  EXPECT_EQ(AtomicNumber("fe"), 0);  // exact case only
  EXPECT_EQ(AtomicNumber("Xx"), 0);
  EXPECT_EQ(AtomicNumber("Og"), 118);
}

TEST(Elements, SpotValuesFromTheNamedSources) {
  // IUPAC 2021 standard atomic weights (conventional value for C and O).
  EXPECT_EQ(FindElement(26)->atomic_weight, 55.845);
  EXPECT_EQ(FindElement(6)->atomic_weight, 12.011);
  EXPECT_EQ(FindElement(8)->atomic_weight, 15.999);
  // Cordero et al. 2008: C sp3 0.76, Fe high spin 1.52, O 0.66, Cm 1.69 the last tabulated.
  EXPECT_EQ(FindElement(6)->covalent_radius, 0.76);
  EXPECT_EQ(FindElement(26)->covalent_radius, 1.52);
  EXPECT_EQ(FindElement(96)->covalent_radius, 1.69);
  EXPECT_TRUE(std::isnan(FindElement(97)->covalent_radius));
  // Pauling electronegativity, CRC Handbook: F 3.98, Cs 0.79; none for Ne.
  EXPECT_EQ(FindElement(9)->electronegativity, 3.98);
  EXPECT_EQ(FindElement(55)->electronegativity, 0.79);
  EXPECT_TRUE(std::isnan(FindElement(10)->electronegativity));
}

TEST(Elements, RadioactiveMeansNoStableIsotope) {
  // Tc, Pm and everything from Po (84) up have no stable isotope (IUPAC; common knowledge).
  for (int z = 1; z <= kMaxAtomicNumber; ++z) {
    const bool expected = z == 43 || z == 61 || z >= 84;
    EXPECT_EQ(FindElement(z)->radioactive, expected) << FindElement(z)->symbol;
  }
}

TEST(Elements, ToxicFlagFollowsTheStatedCriterion) {
  const std::set<int> toxic = {4, 33, 48, 80, 81, 82};  // Be, As, Cd, Hg, Tl, Pb (elements.cc)
  for (int z = 1; z <= kMaxAtomicNumber; ++z) {
    EXPECT_EQ(FindElement(z)->toxic, toxic.count(z) == 1) << FindElement(z)->symbol;
  }
}

}  // namespace
}  // namespace nucleate::elements
