#include "core/structure/io/symmetry_operation.h"

#include <gtest/gtest.h>

#include "core/common/error.h"

namespace nucleate::structure::io {
namespace {

// Operations in the x,y,z notation of International Tables A and the CIF core dictionary
// (_space_group_symop_operation_xyz).
TEST(ParseSymmetryOperation, HexagonalOperationWithTranslation) {
  const SymmetryOperation op = ParseSymmetryOperation("-y+1/2, x-y, z+2/3", "f");
  Eigen::Matrix3i expected;
  expected << 0, -1, 0,
              1, -1, 0,
              0, 0, 1;
  EXPECT_EQ(op.rotation, expected);
  EXPECT_DOUBLE_EQ(op.translation[0], 0.5);
  EXPECT_DOUBLE_EQ(op.translation[1], 0.0);
  EXPECT_DOUBLE_EQ(op.translation[2], 2.0 / 3.0);
}

TEST(ParseSymmetryOperation, ConstantFirstUpperCaseDecimalsAndSigns) {
  const SymmetryOperation a = ParseSymmetryOperation("1/2+x,y,z", "f");
  EXPECT_EQ(a.rotation, Eigen::Matrix3i::Identity());
  EXPECT_DOUBLE_EQ(a.translation[0], 0.5);
  const SymmetryOperation b = ParseSymmetryOperation("+X, -Y, 0.25+Z", "f");
  EXPECT_EQ(b.rotation(1, 1), -1);
  EXPECT_DOUBLE_EQ(b.translation[2], 0.25);
  const SymmetryOperation c = ParseSymmetryOperation("-x+y, -x, z-1/3", "f");
  EXPECT_EQ(c.rotation(0, 0), -1);
  EXPECT_EQ(c.rotation(0, 1), 1);
  EXPECT_DOUBLE_EQ(c.translation[2], -1.0 / 3.0);
}

TEST(ParseSymmetryOperation, AppliesToCoordinates) {
  const SymmetryOperation op = ParseSymmetryOperation("-y+1/2, x-y, z+2/3", "f");
  const Eigen::Vector3d p = op.Apply(Eigen::Vector3d(0.1, 0.2, 0.3));
  EXPECT_NEAR(p[0], -0.2 + 0.5, 1e-15);
  EXPECT_NEAR(p[1], 0.1 - 0.2, 1e-15);
  EXPECT_NEAR(p[2], 0.3 + 2.0 / 3.0, 1e-15);
}

TEST(ParseSymmetryOperation, RefusesGarbledOperations) {
  for (const char* text : {"x,y", "x,y,z,x", "x,y,w", "x+x,y,z", "2x,y,z", "x,y,z+", "x,,z",
                           "x,y,z/2", "x,y,1/0+z", "x,x,z", "xy,y,z", ""}) {
    try {
      ParseSymmetryOperation(text, "demo.cif:9");
      ADD_FAILURE() << "accepted '" << text << "'";
    } catch (const Error& e) {
      EXPECT_EQ(e.kind(), ErrorKind::kInvalidArgument);
      EXPECT_EQ(e.field(), "demo.cif:9");
      EXPECT_NE(e.detail().find(std::string("'") + text + "'"), std::string::npos) << e.what();
    }
  }
}

TEST(FormatSymmetryOperation, RoundTripsThroughTheParser) {
  for (const char* text : {"x, y, z", "-y+1/2, x-y, z+2/3", "-x+y, -x, z+1/3", "y+3/4, x+1/4, -z+1/8",
                           "-x, -y, -z", "x+0.123, y, z"}) {
    const SymmetryOperation op = ParseSymmetryOperation(text, "f");
    const std::string written = FormatSymmetryOperation(op);
    const SymmetryOperation back = ParseSymmetryOperation(written, "f");
    EXPECT_EQ(back.rotation, op.rotation) << text << " -> " << written;
    for (int k = 0; k < 3; ++k) {
      const double d = back.translation[k] - op.translation[k];
      EXPECT_NEAR(d - std::round(d), 0.0, 1e-12) << text << " -> " << written;
    }
  }
  EXPECT_EQ(FormatSymmetryOperation(ParseSymmetryOperation("-y+1/2,x-y,z+2/3", "f")),
            "-y+1/2, x-y, z+2/3");
  EXPECT_EQ(FormatSymmetryOperation(ParseSymmetryOperation("x-1/2,y,z", "f")), "x+1/2, y, z");
}

}  // namespace
}  // namespace nucleate::structure::io
