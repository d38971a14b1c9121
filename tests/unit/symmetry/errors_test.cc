// Bad input gives a typed nucleate::Error, never a crash: spglib 2.0.2 crashes with a
// segmentation fault on a NaN lattice, so these would kill the test binary if the guards failed.
#include <limits>

#include <gtest/gtest.h>

#include "core/common/error.h"
#include "core/symmetry/symmetry.h"
#include "tests/unit/symmetry/textbook_structures.h"

namespace nucleate::symmetry::testing {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
constexpr double kInf = std::numeric_limits<double>::infinity();

structure::Crystal Cu() {
  return BuildFromWyckoff(LatticeFromParameters(3.615, 3.615, 3.615, 90, 90, 90),
                          {Eigen::Vector3d(0, 0, 0), Eigen::Vector3d(0, 0.5, 0.5),
                           Eigen::Vector3d(0.5, 0, 0.5), Eigen::Vector3d(0.5, 0.5, 0)},
                          {{29, 4, {"0,0,0"}}}, "Cu");
}

// Runs every entry point on `c` and checks each raises `kind` naming `field`.
void ExpectEveryCallRefuses(const structure::Crystal& c, ErrorKind kind, const std::string& field) {
  auto check = [&](const char* what, auto&& call) {
    try {
      call();
      ADD_FAILURE() << what << " accepted the input";
    } catch (const Error& e) {
      EXPECT_EQ(e.kind(), kind) << what << ": " << e.what();
      EXPECT_EQ(e.field(), field) << what << ": " << e.what();
    }
  };
  check("AnalyseSymmetry", [&] { AnalyseSymmetry(c); });
  check("StandardConventionalCell", [&] { StandardConventionalCell(c); });
  check("StandardPrimitiveCell", [&] { StandardPrimitiveCell(c); });
  check("Symmetrise", [&] { Symmetrise(c); });
  check("NiggliReduce", [&] { NiggliReduce(c); });
  check("DelaunayReduce", [&] { DelaunayReduce(c); });
  check("StandardSettingForCif", [&] { StandardSettingForCif(c); });
}

TEST(Errors, NaNLattice) {
  structure::Crystal c = Cu();
  c.lattice(1, 2) = kNaN;
  ExpectEveryCallRefuses(c, ErrorKind::kInvalidArgument, "lattice");
}

TEST(Errors, InfiniteLattice) {
  structure::Crystal c = Cu();
  c.lattice(0, 0) = kInf;
  ExpectEveryCallRefuses(c, ErrorKind::kInvalidArgument, "lattice");
}

TEST(Errors, ZeroVolume) {
  structure::Crystal c = Cu();
  c.lattice.row(2) = c.lattice.row(0) + c.lattice.row(1);  // coplanar
  ExpectEveryCallRefuses(c, ErrorKind::kInvalidArgument, "lattice");
  c.lattice.setZero();
  ExpectEveryCallRefuses(c, ErrorKind::kInvalidArgument, "lattice");
}

TEST(Errors, EmptyStructure) {
  structure::Crystal c = Cu();
  c.numbers.clear();
  c.frac.clear();
  ExpectEveryCallRefuses(c, ErrorKind::kInvalidArgument, "numbers");
}

TEST(Errors, SizesDisagree) {
  structure::Crystal c = Cu();
  c.frac.pop_back();
  ExpectEveryCallRefuses(c, ErrorKind::kInvalidArgument, "frac");
}

TEST(Errors, NaNPosition) {
  structure::Crystal c = Cu();
  c.frac[2][1] = kNaN;
  ExpectEveryCallRefuses(c, ErrorKind::kInvalidArgument, "frac[2]");
}

TEST(Errors, BadTolerances) {
  const structure::Crystal c = Cu();
  for (double bad : {0.0, -0.1, kNaN, kInf}) {
    try {
      AnalyseSymmetry(c, bad);
      ADD_FAILURE() << "symprec " << bad << " accepted";
    } catch (const Error& e) {
      EXPECT_EQ(e.kind(), ErrorKind::kInvalidArgument);
      EXPECT_EQ(e.field(), "symprec");
    }
    try {
      NiggliReduce(c, bad);
      ADD_FAILURE() << "eps " << bad << " accepted";
    } catch (const Error& e) {
      EXPECT_EQ(e.field(), "eps");
    }
  }
  try {
    AnalyseSymmetry(c, 0.1, kNaN);
    ADD_FAILURE() << "NaN angle_tolerance accepted";
  } catch (const Error& e) {
    EXPECT_EQ(e.field(), "angle_tolerance");
  }
}

TEST(Errors, NoSpaceGroupFoundIsNumericalAndNamesTheTolerance) {
  // Two atoms of the same species 0.05 A apart: spglib refuses the cell at symprec 0.1 ("too
  // close distance between atoms") and returns NULL. (Observed with python3-spglib 2.0.2, which
  // wraps the same library; spglib does not refuse overlapping atoms of different species.)
  structure::Crystal c;
  c.lattice = LatticeFromParameters(4, 4, 4, 90, 90, 90);
  c.numbers = {11, 11};
  c.frac = {Eigen::Vector3d(0.1, 0.1, 0.1), Eigen::Vector3d(0.1 + 0.05 / 4, 0.1, 0.1)};
  for (auto call : {+[](const structure::Crystal& x) { AnalyseSymmetry(x, 0.1); },
                    +[](const structure::Crystal& x) { Symmetrise(x, 0.1); },
                    +[](const structure::Crystal& x) { StandardPrimitiveCell(x, 0.1); }}) {
    try {
      call(c);
      ADD_FAILURE() << "no error for overlapping atoms";
    } catch (const Error& e) {
      EXPECT_EQ(e.kind(), ErrorKind::kNumerical) << e.what();
      EXPECT_EQ(e.field(), "symprec");
      EXPECT_NE(std::string(e.what()).find("0.1"), std::string::npos) << e.what();
    }
  }
  // The same cell at a tolerance below the separation is analysed normally.
  EXPECT_GE(AnalyseSymmetry(c, 0.01).number, 1);
}

TEST(Errors, CrystalSystemOutOfRange) {
  for (int bad : {0, -1, 231}) {
    try {
      CrystalSystemOf(bad);
      ADD_FAILURE() << bad;
    } catch (const Error& e) {
      EXPECT_EQ(e.kind(), ErrorKind::kInvalidArgument);
    }
  }
}

TEST(Errors, AsymmetricUnitOfAnotherStructure) {
  const structure::Crystal c = Cu();
  const SymmetryInfo info = AnalyseSymmetry(c);
  structure::Crystal other = c;
  other.numbers.push_back(29);
  other.frac.push_back(Eigen::Vector3d(0.25, 0.25, 0.25));
  EXPECT_THROW(AsymmetricUnit(other, info), Error);
}

}  // namespace
}  // namespace nucleate::symmetry::testing
