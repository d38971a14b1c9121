// nucleate_reply_doubles: the way callers without protobuf read replies.
#include <gtest/gtest.h>

#include "call_helpers.h"
#include "nucleate/v1/schedule.pb.h"

namespace nucleate::test {
namespace {

struct Values {
  nucleate_status status;
  std::vector<double> values;
  std::string message;
};

Values Read(const std::string& method, const std::string& reply, const char* path) {
  double* values = nullptr;
  size_t count = 0;
  char* message = nullptr;
  Values out;
  out.status = nucleate_reply_doubles(method.c_str(), reply.data(), reply.size(),
                                      NUCLEATE_ENCODING_JSON, path, &values, &count, &message);
  if (values != nullptr) out.values.assign(values, values + count);
  if (message != nullptr) out.message = message;
  nucleate_free(values);
  nucleate_free(message);
  return out;
}

TEST(ReplyDoubles, ReadsAColumnOfRepeatedRows) {
  const CallResult table = Call("Schedule", R"({"variance":{"steps":1000}})");
  ASSERT_EQ(table.status, NUCLEATE_OK) << table.message;
  const Values beta = Read("Schedule", table.reply, "variance_steps.beta");
  ASSERT_EQ(beta.status, NUCLEATE_OK) << beta.message;
  ASSERT_EQ(beta.values.size(), 1000u);
  // Ho et al. 2020, section 4: beta from 1e-4 to 0.02, linearly, over T = 1000.
  EXPECT_DOUBLE_EQ(beta.values.front(), 1e-4);
  EXPECT_DOUBLE_EQ(beta.values.back(), 0.02);
  const Values t = Read("Schedule", table.reply, "variance_steps.t");
  ASSERT_EQ(t.values.size(), 1000u);
  EXPECT_EQ(t.values[41], 42.0);  // int64 fields come back as numbers too
  const Values steps = Read("Schedule", table.reply, "resolved.variance.steps");
  ASSERT_EQ(steps.values.size(), 1u);
  EXPECT_EQ(steps.values[0], 1000.0);
}

TEST(ReplyDoubles, AnIndexPicksOneElementOfARepeatedField) {
  const CallResult table = Call("Schedule", R"({"variance":{"steps":5}})");
  ASSERT_EQ(table.status, NUCLEATE_OK) << table.message;
  const Values all = Read("Schedule", table.reply, "variance_steps.beta");
  const Values third = Read("Schedule", table.reply, "variance_steps[2].beta");
  ASSERT_EQ(third.status, NUCLEATE_OK) << third.message;
  ASSERT_EQ(third.values.size(), 1u);
  EXPECT_EQ(third.values[0], all.values[2]);
  EXPECT_EQ(Read("Schedule", table.reply, "variance_steps[5].beta").status,
            NUCLEATE_ERROR_INVALID_ARGUMENT);  // past the end
  EXPECT_EQ(Read("Schedule", table.reply, "variance_steps[x].beta").status,
            NUCLEATE_ERROR_INVALID_ARGUMENT);
  EXPECT_EQ(Read("Schedule", table.reply, "resolved[0].limits.max_steps").status,
            NUCLEATE_ERROR_INVALID_ARGUMENT);  // not repeated
}

TEST(ReplyDoubles, NamesThePathPartThatDoesNotExist) {
  const CallResult table = Call("Schedule", R"({"variance":{"steps":3}})");
  const Values missing = Read("Schedule", table.reply, "variance_steps.alpha_bra");
  EXPECT_EQ(missing.status, NUCLEATE_ERROR_INVALID_ARGUMENT);
  EXPECT_NE(missing.message.find("variance_steps.alpha_bra"), std::string::npos)
      << missing.message;
  const Values not_numeric = Read("Schedule", table.reply, "variance_steps");
  EXPECT_EQ(not_numeric.status, NUCLEATE_ERROR_INVALID_ARGUMENT);
  const Values empty_part = Read("Schedule", table.reply, "variance_steps..beta");
  EXPECT_EQ(empty_part.status, NUCLEATE_ERROR_INVALID_ARGUMENT);
  const Values garbage = Read("Schedule", "{not json", "variance_steps.beta");
  EXPECT_EQ(garbage.status, NUCLEATE_ERROR_MALFORMED_REQUEST);
  const Values unknown = Read("Nope", table.reply, "x");
  EXPECT_EQ(unknown.status, NUCLEATE_ERROR_UNKNOWN_METHOD);
}

TEST(Limits, ACallerMayRaiseTheStepLimitUpToTheCeiling) {
  const CallResult refused = Call("Schedule", R"({"sigma":{"steps":150000}})");
  EXPECT_EQ(refused.status, NUCLEATE_ERROR_LIMIT_EXCEEDED) << refused.message;
  EXPECT_NE(refused.message.find("sigma.steps"), std::string::npos) << refused.message;
  EXPECT_NE(refused.message.find("100000"), std::string::npos) << "names the limit";
  // Binary: printing 150000 rows as JSON would only measure the JSON printer.
  v1::ScheduleRequest request;
  request.mutable_variance()->set_steps(150000);
  request.mutable_limits()->set_max_steps(200000);
  const CallResult raised =
      Call("Schedule", request.SerializeAsString(), NUCLEATE_ENCODING_BINARY);
  ASSERT_EQ(raised.status, NUCLEATE_OK) << raised.message;
  v1::ScheduleTable table;
  ASSERT_TRUE(table.ParseFromString(raised.reply));
  EXPECT_EQ(table.variance_steps_size(), 150000);
}

}  // namespace
}  // namespace nucleate::test
