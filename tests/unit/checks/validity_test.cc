#include "core/checks/validity.h"

#include <cmath>
#include <string>

#include <gtest/gtest.h>

#include "core/common/error.h"
#include "tests/unit/structure/crystal_builders.h"

namespace nucleate::checks {
namespace {

using structure::Crystal;

bool Has(const ValidityResult& r, ProblemCode code) {
  for (const Problem& p : r.problems) {
    if (p.code == code) return true;
  }
  return false;
}

std::string MessageOf(const ValidityResult& r, ProblemCode code) {
  for (const Problem& p : r.problems) {
    if (p.code == code) return p.message;
  }
  return "";
}

// NaCl, a = 5.640 A (CRC Handbook lattice constant, from memory).
const Crystal kNaCl = testing::RockSalt(11, 17, 5.640);

TEST(Validity, RockSaltPasses) {
  const ValidityResult r = CheckValidity(kNaCl);
  EXPECT_TRUE(r.valid) << (r.problems.empty() ? "" : r.problems[0].message);
  EXPECT_NEAR(r.min_distance.distance, 2.82, 1e-12);
  EXPECT_NEAR(r.volume_per_atom, std::pow(5.64, 3) / 8, 1e-10);
  // CRC Handbook density of NaCl 2.165 g/cm3; a = 5.640 A gives 2.163.
  EXPECT_NEAR(r.density, 2.165, 0.005);
  EXPECT_EQ(r.charge.status, ChargeStatus::kNeutral);
  EXPECT_TRUE(r.toxic_elements.empty());
  EXPECT_TRUE(r.radioactive_elements.empty());
}

TEST(Validity, OverlappingAtomsNameTheirSites) {
  Crystal c = kNaCl;
  c.frac[7] = c.frac[3] + Eigen::Vector3d(0.05, 0, 0);  // Cl 0.28 A from Na site 3
  const ValidityResult r = CheckValidity(c);
  EXPECT_FALSE(r.valid);
  EXPECT_EQ(r.min_distance.i, 3u);
  EXPECT_EQ(r.min_distance.j, 7u);
  const std::string m = MessageOf(r, ProblemCode::kMinDistance);
  EXPECT_NE(m.find("min_distance: 0.282 A between site 3 (Na) and site 7 (Cl) below 0.5 A"),
            std::string::npos) << m;
  EXPECT_TRUE(Has(r, ProblemCode::kCovalentOverlap));
}

TEST(Validity, CovalentFractionCatchesWhatTheAbsoluteRuleMisses) {
  // Two Cs atoms 1.5 A apart: above 0.5 A, but 0.31 of 2 x 2.44 A (Cordero 2008).
  Crystal c = testing::MakeCrystal(testing::Cubic(6.0), {55, 55, 9, 9},
                                   {{0, 0, 0}, {0.25, 0, 0}, {0.5, 0.5, 0.5}, {0.5, 0.5, 0}});
  const ValidityResult r = CheckValidity(c);
  EXPECT_FALSE(Has(r, ProblemCode::kMinDistance));
  EXPECT_TRUE(Has(r, ProblemCode::kCovalentOverlap));
  EXPECT_NE(MessageOf(r, ProblemCode::kCovalentOverlap).find("site 0 (Cs) and site 1 (Cs)"),
            std::string::npos);
}

TEST(Validity, AtomTooCloseToItsOwnImage) {
  const Crystal c = testing::MakeCrystal(testing::Cubic(0.45), {3}, {{0, 0, 0}});
  const ValidityResult r = CheckValidity(c);
  EXPECT_NEAR(r.min_distance.distance, 0.45, 1e-12);
  EXPECT_NE(MessageOf(r, ProblemCode::kMinDistance).find("its own periodic image"), std::string::npos);
  EXPECT_TRUE(Has(r, ProblemCode::kVolumePerAtom));
}

TEST(Validity, CellShapeRules) {
  Crystal c = kNaCl;
  c.lattice = testing::SkewedLattice(5.64, 5.64, 5.64, 90, 90, 15) ;
  ValidityResult r = CheckValidity(c);
  EXPECT_NE(MessageOf(r, ProblemCode::kLatticeAngle).find("gamma"), std::string::npos);
  c = kNaCl;
  c.lattice(2, 2) = 5.64 * 20;
  r = CheckValidity(c);
  EXPECT_TRUE(Has(r, ProblemCode::kAxisRatio));
  EXPECT_TRUE(Has(r, ProblemCode::kVolumePerAtom));  // 795 A^3 per atom
}

TEST(Validity, ChargeAndElectronegativityProblems) {
  // NaCl2 in a cell where geometry is fine.
  Crystal nacl2 = testing::MakeCrystal(testing::Cubic(5.0), {11, 17, 17},
                                       {{0, 0, 0}, {0.5, 0.5, 0.5}, {0.5, 0, 0}});
  ValidityResult r = CheckValidity(nacl2);
  EXPECT_TRUE(Has(r, ProblemCode::kChargeNeutrality));
  EXPECT_EQ(r.charge.status, ChargeStatus::kNotNeutral);

  Crystal auh = testing::MakeCrystal(testing::Cubic(3.0), {79, 1}, {{0, 0, 0}, {0.5, 0.5, 0.5}});
  r = CheckValidity(auh);
  const std::string m = MessageOf(r, ProblemCode::kElectronegativityOrder);
  EXPECT_NE(m.find("cation Au+1 (Pauling 2.54) is more electronegative than anion H-1 (Pauling 2.2)"),
            std::string::npos) << m;

  ValidityThresholds off;
  off.check_charge_neutrality = false;
  r = CheckValidity(nacl2, off);
  EXPECT_FALSE(Has(r, ProblemCode::kChargeNeutrality));
  EXPECT_EQ(r.charge.status, ChargeStatus::kUndetermined);
}

TEST(Validity, FlagsAreNotFailures) {
  // PbO in a rock-salt cell: Pb is flagged toxic, and the structure is still valid.
  Crystal c = testing::RockSalt(82, 8, 5.0);
  ValidityResult r = CheckValidity(c);
  EXPECT_EQ(r.toxic_elements, std::vector<int>{82});
  EXPECT_TRUE(r.valid) << (r.problems.empty() ? "" : r.problems[0].message);
  // UO in a rock-salt cell: U is flagged radioactive whatever else is reported.
  c = testing::RockSalt(92, 8, 4.93);
  r = CheckValidity(c);
  EXPECT_EQ(r.radioactive_elements, std::vector<int>{92});
}

TEST(Validity, DefectsBecomeProblemsAndLimitsThrow) {
  Crystal c = kNaCl;
  c.frac[4][2] = NAN;
  ValidityResult r = CheckValidity(c);
  EXPECT_FALSE(r.valid);
  ASSERT_EQ(r.problems.size(), 1u);
  EXPECT_EQ(r.problems[0].code, ProblemCode::kNonFinite);
  EXPECT_NE(r.problems[0].message.find("frac_coords[14]"), std::string::npos);  // 3 * 4 + 2
  EXPECT_TRUE(std::isnan(r.density));
  c = kNaCl;
  c.numbers[1] = 0;
  r = CheckValidity(c);
  EXPECT_EQ(r.problems.at(0).code, ProblemCode::kInvalidStructure);
  EXPECT_NE(r.problems[0].message.find("atomic_numbers[1]"), std::string::npos);

  structure::StructureLimits small;
  small.max_atoms = 2;
  EXPECT_THROW(CheckValidity(kNaCl, {}, small), Error);
}

TEST(Validity, BadThresholdsNameTheField) {
  auto field = [](ValidityThresholds t) {
    try {
      CheckValidity(kNaCl, t);
    } catch (const Error& e) {
      return e.field();
    }
    return std::string("(none)");
  };
  ValidityThresholds t;
  t.min_distance = NAN;
  EXPECT_EQ(field(t), "min_distance");
  t = {};
  t.max_volume_per_atom = 1;
  EXPECT_EQ(field(t), "max_volume_per_atom");
  t = {};
  t.max_angle = 10;
  EXPECT_EQ(field(t), "max_angle");
  t = {};
  t.max_axis_ratio = 0.5;
  EXPECT_EQ(field(t), "max_axis_ratio");
  t = {};
  t.charge_search.max_combinations = 0;
  EXPECT_EQ(field(t), "charge_search.max_combinations");
}

}  // namespace
}  // namespace nucleate::checks
