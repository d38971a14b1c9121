// The method table against the service block, and the encodings.
#include <set>

#include <google/protobuf/descriptor.h>
#include <google/protobuf/util/json_util.h>
#include <google/protobuf/util/message_differencer.h>
#include <gtest/gtest.h>

#include "call_helpers.h"
#include "dispatch.h"
#include "nucleate/v1/error.pb.h"
#include "nucleate/v1/schedule.pb.h"
#include "nucleate/v1/service.pb.h"

namespace nucleate::test {
namespace {

namespace pb = google::protobuf;

const pb::ServiceDescriptor* Service() {
  return pb::DescriptorPool::generated_pool()->FindServiceByName("nucleate.v1.Nucleate");
}

TEST(MethodTable, EveryRpcOfTheServiceBlockHasAHandlerWithItsTypes) {
  const pb::ServiceDescriptor* service = Service();
  ASSERT_NE(service, nullptr);
  std::set<std::string> rpcs;
  for (int i = 0; i < service->method_count(); ++i) {
    const pb::MethodDescriptor* rpc = service->method(i);
    rpcs.insert(rpc->name());
    const capi::MethodEntry* entry = capi::FindMethod(rpc->name().c_str());
    ASSERT_NE(entry, nullptr) << rpc->name() << " has no handler";
    EXPECT_EQ(entry->request_prototype().GetDescriptor(), rpc->input_type()) << rpc->name();
    EXPECT_EQ(entry->reply_prototype().GetDescriptor(), rpc->output_type()) << rpc->name();
  }
  for (const capi::MethodEntry& entry : capi::Methods()) {
    EXPECT_TRUE(rpcs.count(entry.name)) << entry.name << " is not in the service block";
  }
}

TEST(MethodTable, VersionListsEveryMethod) {
  const CallResult result = Call("Version", "{}");
  ASSERT_EQ(result.status, NUCLEATE_OK) << result.message;
  v1::VersionReply reply;
  ASSERT_TRUE(pb::util::JsonStringToMessage(result.reply, &reply).ok());
  EXPECT_EQ(reply.version(), nucleate_version());
  EXPECT_EQ(reply.abi_version(), NUCLEATE_ABI_VERSION);
  EXPECT_EQ(reply.methods_size(), Service()->method_count());
}

TEST(Encodings, BinaryAndJsonCarryTheSameReply) {
  v1::ScheduleRequest request;
  request.mutable_variance()->set_kind(v1::VARIANCE_KIND_COSINE);
  request.mutable_variance()->set_steps(50);
  std::string binary_request, json_request;
  ASSERT_TRUE(request.SerializeToString(&binary_request));
  ASSERT_TRUE(pb::util::MessageToJsonString(request, &json_request).ok());

  const CallResult binary = Call("Schedule", binary_request, NUCLEATE_ENCODING_BINARY);
  const CallResult json = Call("Schedule", json_request, NUCLEATE_ENCODING_JSON);
  ASSERT_EQ(binary.status, NUCLEATE_OK) << binary.message;
  ASSERT_EQ(json.status, NUCLEATE_OK) << json.message;
  v1::ScheduleTable from_binary, from_json;
  ASSERT_TRUE(from_binary.ParseFromString(binary.reply));
  ASSERT_TRUE(pb::util::JsonStringToMessage(json.reply, &from_json).ok());
  EXPECT_EQ(from_binary.variance_steps_size(), 50);
  // JSON prints doubles with round-trip precision, so the two must be equal exactly.
  pb::util::MessageDifferencer differencer;
  std::string differences;
  differencer.ReportDifferencesToString(&differences);
  EXPECT_TRUE(differencer.Compare(from_binary, from_json)) << differences;
}

TEST(Encodings, JsonRepliesUseProtoFieldNamesAndPrintDefaults) {
  const CallResult result = Call("Schedule", R"({"variance":{"steps":2}})");
  ASSERT_EQ(result.status, NUCLEATE_OK) << result.message;
  EXPECT_NE(result.reply.find("\"alpha_bar\""), std::string::npos);
  EXPECT_NE(result.reply.find("\"zero_terminal_snr\":false"), std::string::npos);
  EXPECT_EQ(result.reply.find("alphaBar"), std::string::npos);
}

TEST(Encodings, FailedCallsReplyWithAnErrorDetailInTheCallersEncoding) {
  const CallResult json = Call("Schedule", R"({"variance":{"steps":0}})");
  ASSERT_EQ(json.status, NUCLEATE_ERROR_INVALID_ARGUMENT);
  v1::ErrorDetail detail;
  ASSERT_TRUE(pb::util::JsonStringToMessage(json.reply, &detail).ok()) << json.reply;
  EXPECT_EQ(detail.code(), NUCLEATE_ERROR_INVALID_ARGUMENT);
  EXPECT_EQ(detail.status(), "NUCLEATE_ERROR_INVALID_ARGUMENT");
  EXPECT_EQ(detail.field(), "variance.steps");
  EXPECT_EQ(detail.method(), "Schedule");
  EXPECT_EQ(detail.message(), json.message);

  const CallResult binary = Call("Schedule", std::string("\x0a\x02\x10\x00", 4),
                                 NUCLEATE_ENCODING_BINARY);
  ASSERT_EQ(binary.status, NUCLEATE_ERROR_INVALID_ARGUMENT) << binary.message;
  ASSERT_TRUE(detail.ParseFromString(binary.reply));
  EXPECT_EQ(detail.field(), "variance.steps");
}

// nucleate_call_collective: the processes are checked before anything runs, and only a method
// that shares its work (Train) accepts more than one.
int32_t SumNothing(double*, int64_t, void*) { return 0; }

std::string CollectiveField(const nucleate_collective_v1* collective, const char* method,
                            nucleate_status* status) {
  void* reply = nullptr;
  size_t size = 0;
  char* message = nullptr;
  const std::string request = "{}";
  *status = nucleate_call_collective(method, request.data(), request.size(),
                                     NUCLEATE_ENCODING_JSON, collective, nullptr, nullptr,
                                     nullptr, &reply, &size, &message);
  v1::ErrorDetail detail;
  if (*status != NUCLEATE_OK) {
    EXPECT_TRUE(pb::util::JsonStringToMessage(std::string(static_cast<char*>(reply), size),
                                              &detail).ok());
    EXPECT_NE(std::string(message).find(detail.field()), std::string::npos) << message;
  }
  nucleate_free(reply);
  nucleate_free(message);
  return detail.field();
}

TEST(Collective, ProcessesAreCheckedAndOnlyTrainSpansThem) {
  nucleate_status status = NUCLEATE_OK;
  EXPECT_EQ(CollectiveField(nullptr, "Version", &status), "");
  EXPECT_EQ(status, NUCLEATE_OK);
  nucleate_collective_v1 one{sizeof(nucleate_collective_v1), 0, 1, nullptr, nullptr};
  CollectiveField(&one, "Version", &status);
  EXPECT_EQ(status, NUCLEATE_OK);

  nucleate_collective_v1 two{sizeof(nucleate_collective_v1), 1, 2, &SumNothing, nullptr};
  EXPECT_EQ(CollectiveField(&two, "Version", &status), "collective");
  EXPECT_EQ(status, NUCLEATE_ERROR_INVALID_ARGUMENT);
  nucleate_collective_v1 outside = two;
  outside.rank = 2;
  EXPECT_EQ(CollectiveField(&outside, "Train", &status), "collective.rank");
  nucleate_collective_v1 no_sum = two;
  no_sum.sum_doubles = nullptr;
  EXPECT_EQ(CollectiveField(&no_sum, "Train", &status), "collective.sum_doubles");
  nucleate_collective_v1 old = two;
  old.struct_size = 8;
  EXPECT_EQ(CollectiveField(&old, "Train", &status), "collective.struct_size");
  nucleate_collective_v1 none = two;
  none.size = 0;
  EXPECT_EQ(CollectiveField(&none, "Train", &status), "collective.size");
  // Train with two processes passes the check and fails on its (empty) configuration instead.
  EXPECT_NE(CollectiveField(&two, "Train", &status).rfind("collective", 0), 0u);
  EXPECT_NE(status, NUCLEATE_OK);
}

}  // namespace
}  // namespace nucleate::test
