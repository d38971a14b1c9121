// Text in protobuf messages: repair of string fields that are not UTF-8, and parsing without
// libprotobuf's log lines. (The UTF-8 rules themselves are checked against Python's codec in
// tests/reference/utf8.)
#include "core/common/message_text.h"

#include <string>

#include <gtest/gtest.h>

#include "nucleate/v1/checks.pb.h"
#include "nucleate/v1/error.pb.h"

namespace nucleate {
namespace {

const std::string kBad = "ab\xff" "c";              // 0xFF never occurs in UTF-8
const std::string kRepaired = "ab\xEF\xBF\xBD" "c";  // U+FFFD in its place

TEST(RepairStringFields, ReachesNestedRepeatedAndMapFields) {
  v1::CheckReply reply;
  v1::StructureReport* report = reply.add_reports();
  report->set_source(kBad);                      // singular, inside a repeated message
  report->add_warnings("fine");
  report->add_warnings(kBad);                    // repeated string
  report->mutable_error()->set_message(kBad);    // nested message
  ASSERT_TRUE(HasInvalidStringField(reply));

  EXPECT_TRUE(RepairStringFields(&reply));
  EXPECT_EQ(reply.reports(0).source(), kRepaired);
  EXPECT_EQ(reply.reports(0).warnings(0), "fine");
  EXPECT_EQ(reply.reports(0).warnings(1), kRepaired);
  EXPECT_EQ(reply.reports(0).error().message(), kRepaired);
  EXPECT_FALSE(HasInvalidStringField(reply));
  EXPECT_FALSE(RepairStringFields(&reply)) << "a second repair finds nothing";

  std::string bytes;
  ASSERT_TRUE(reply.SerializeToString(&bytes));
  v1::CheckReply parsed;
  EXPECT_TRUE(parsed.ParseFromString(bytes)) << "the repaired reply parses";
}

TEST(RepairStringFields, LeavesValidTextAlone) {
  v1::ErrorDetail detail;
  detail.set_message("Cu\xE2\x82\x82O: Gr\xC3\xBC\xC3\x9F \xF0\x9F\x98\x80");  // UTF-8 of various lengths
  const std::string before = detail.message();
  EXPECT_FALSE(HasInvalidStringField(detail));
  EXPECT_FALSE(RepairStringFields(&detail));
  EXPECT_EQ(detail.message(), before);
}

TEST(ParseQuietly, RefusesInvalidTextWithoutWritingToStderr) {
  // ErrorDetail.message (field 3, length-delimited) holding one 0xFF byte.
  const std::string bytes = std::string("\x1a\x01\xff", 3);
  v1::ErrorDetail detail;
  testing::internal::CaptureStderr();
  const bool parsed = ParseQuietly(bytes, &detail);
  const std::string printed = testing::internal::GetCapturedStderr();
  EXPECT_FALSE(parsed);
  EXPECT_EQ(printed, "");

  // The same field with valid text parses.
  EXPECT_TRUE(ParseQuietly(std::string("\x1a\x02ok", 4), &detail));
  EXPECT_EQ(detail.message(), "ok");
}

}  // namespace
}  // namespace nucleate
