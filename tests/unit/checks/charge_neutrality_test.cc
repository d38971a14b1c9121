#include "core/checks/charge_neutrality.h"

#include <numeric>
#include <vector>

#include <gtest/gtest.h>

namespace nucleate::checks {
namespace {

std::vector<int> Formula(std::initializer_list<std::pair<int, int>> parts) {
  std::vector<int> numbers;
  for (const auto& [z, count] : parts) numbers.insert(numbers.end(), count, z);
  return numbers;
}

int StateOf(const ChargeAssignment& a, int z) {
  for (const ElementState& s : a.states) {
    if (s.number == z) return s.state;
  }
  return 0;
}

int SiteSum(const ChargeAssignment& a) { return std::accumulate(a.site_states.begin(), a.site_states.end(), 0); }

// Oxidation states of these textbook compounds: Greenwood & Earnshaw, 2nd ed. (from memory).
TEST(ChargeNeutrality, SodiumChloride) {
  const auto a = AssignOxidationStates(Formula({{11, 4}, {17, 4}}));
  ASSERT_EQ(a.status, ChargeStatus::kNeutral);
  EXPECT_EQ(StateOf(a, 11), 1);
  EXPECT_EQ(StateOf(a, 17), -1);
  EXPECT_FALSE(a.mixed_valence);
  EXPECT_TRUE(a.electronegativity_order_ok);
  EXPECT_EQ(a.site_states.size(), 8u);
  EXPECT_EQ(SiteSum(a), 0);
}

TEST(ChargeNeutrality, StrontiumTitanate) {
  // Sites in an interleaved order to check the per-site states follow the sites.
  const auto a = AssignOxidationStates({8, 38, 8, 22, 8});
  ASSERT_EQ(a.status, ChargeStatus::kNeutral);
  EXPECT_EQ(a.site_states, (std::vector<int>{-2, 2, -2, 4, -2}));
  EXPECT_FALSE(a.mixed_valence);
}

TEST(ChargeNeutrality, MagnetiteNeedsMixedValence) {
  // Fe3O4: one Fe2+ and two Fe3+ per formula unit; no single Fe state balances O2-.
  for (int units : {1, 2, 8}) {
    const auto a = AssignOxidationStates(Formula({{26, 3 * units}, {8, 4 * units}}));
    ASSERT_EQ(a.status, ChargeStatus::kNeutral) << units;
    EXPECT_TRUE(a.mixed_valence);
    int fe2 = 0, fe3 = 0;
    for (const ElementState& s : a.states) {
      if (s.number == 26 && s.state == 2) fe2 = s.count;
      if (s.number == 26 && s.state == 3) fe3 = s.count;
    }
    EXPECT_EQ(fe2, units);
    EXPECT_EQ(fe3, 2 * units);
    EXPECT_EQ(SiteSum(a), 0);
  }
}

TEST(ChargeNeutrality, SodiumDichlorideFails) {
  // NaCl2: Na only +1; two Cl of one sign sum to an even number, never -1.
  const auto a = AssignOxidationStates(Formula({{11, 1}, {17, 2}}));
  EXPECT_EQ(a.status, ChargeStatus::kNotNeutral);
  EXPECT_FALSE(a.reason.empty());
  EXPECT_TRUE(a.site_states.empty());
}

TEST(ChargeNeutrality, GoldHydrideBreaksElectronegativityOrder) {
  // AuH: the only neutral assignment is Au+ H-, and Au (Pauling 2.54) is more electronegative
  // than H (2.20, CRC Handbook).
  const auto a = AssignOxidationStates({79, 1});
  ASSERT_EQ(a.status, ChargeStatus::kNeutral);
  EXPECT_FALSE(a.electronegativity_order_ok);
  EXPECT_EQ(a.most_electronegative_cation, 79);
  EXPECT_EQ(a.least_electronegative_anion, 1);
}

TEST(ChargeNeutrality, PrefersTheAssignmentWithTheRightOrder) {
  // BrCl balances both as Br+ Cl- and Br- Cl+; Cl (3.16) is more electronegative than Br (2.96).
  const auto a = AssignOxidationStates({35, 17});
  ASSERT_EQ(a.status, ChargeStatus::kNeutral);
  EXPECT_EQ(StateOf(a, 35), 1);
  EXPECT_EQ(StateOf(a, 17), -1);
  EXPECT_TRUE(a.electronegativity_order_ok);
}

TEST(ChargeNeutrality, MetalsAndElementsAreNotJudged) {
  EXPECT_EQ(AssignOxidationStates({29, 29, 29, 79}).status, ChargeStatus::kNotApplicable);  // Cu3Au
  EXPECT_EQ(AssignOxidationStates({14, 14}).status, ChargeStatus::kNotApplicable);          // Si
  // A noble gas in a compound with an anion-capable element cannot balance.
  const auto xef2 = AssignOxidationStates({54, 9, 9});
  EXPECT_EQ(xef2.status, ChargeStatus::kNotNeutral);
  EXPECT_NE(xef2.reason.find("Xe"), std::string::npos);
}

TEST(ChargeNeutrality, BoundsGiveUndetermined) {
  ChargeSearchBounds tight;
  tight.max_combinations = 2;  // Fe (2 states) x O (1) = 2: allowed; Mn x O x Cl exceeds
  EXPECT_EQ(AssignOxidationStates(Formula({{25, 1}, {8, 1}, {17, 1}}), tight).status,
            ChargeStatus::kUndetermined);
  ChargeSearchBounds few_sites;
  few_sites.max_sites_mixed_valence = 6;
  const auto a = AssignOxidationStates(Formula({{26, 3}, {8, 4}}), few_sites);
  EXPECT_EQ(a.status, ChargeStatus::kUndetermined);
  EXPECT_NE(a.reason.find("mixed valence"), std::string::npos);
}

TEST(ChargeNeutrality, NeverMixesSignsWithinAnElement) {
  // NaCl3 would balance as Na+ Cl- Cl- Cl+, which is not chemistry; with one sign per element
  // three Cl total -3 or at least +3, never the -1 that Na+ needs.
  EXPECT_EQ(AssignOxidationStates(Formula({{11, 1}, {17, 3}})).status, ChargeStatus::kNotNeutral);
}

}  // namespace
}  // namespace nucleate::checks
