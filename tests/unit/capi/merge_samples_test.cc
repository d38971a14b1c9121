// MergeSamples through the C entry points: parts of one Sample request, split by sample index,
// join into the whole request's reply byte for byte; duplicates are grouped again across parts;
// overlapping or empty parts are refused naming the field. The candidates come from a small
// network with random weights saved as a model file (their chemistry means nothing here).
#include <cmath>
#include <filesystem>
#include <string>

#include <google/protobuf/util/json_util.h>
#include <gtest/gtest.h>

#include "call_helpers.h"
#include "core/model/bundle/bundle_file.h"
#include "nucleate/v1/error.pb.h"
#include "nucleate/v1/sample.pb.h"
#include "tests/unit/bundle/bundle_fixture.h"
#include "tests/unit/sample/random_network.h"

namespace nucleate::test {
namespace {

namespace fs = std::filesystem;
namespace pb = google::protobuf;

class MergeSamples : public ::testing::Test {
 protected:
  static void SetUpTestSuite() {
    directory_ = new model::testing::TemporaryDirectory;  // this process's own folder
    model_ = new std::string((fs::path(directory_->path()) / "given.nucleate").string());
    model::SaveModelBundle(*model_, sample::testing::RandomNetwork());
  }
  static void TearDownTestSuite() {
    delete model_;
    delete directory_;
  }

  // The request for indices [first, first + count) of one campaign (Na2Cl2, seed 21).
  static v1::SampleRequest Request(int first, int count, int threads) {
    const std::string json = "{\"model_path\": \"" + *model_ +
                             R"(", "composition": {"formula": "Na2Cl2"}, "seed": 21, "first_index": )" +
                             std::to_string(first) + ", \"count\": " + std::to_string(count) +
                             ", \"threads\": " + std::to_string(threads) + "}";
    v1::SampleRequest request;
    EXPECT_TRUE(pb::util::JsonStringToMessage(json, &request).ok());
    return request;
  }

  static v1::SampleReply Sample(int first, int count, int threads) {
    const CallResult r =
        Call("Sample", Request(first, count, threads).SerializeAsString(), NUCLEATE_ENCODING_BINARY);
    EXPECT_EQ(r.status, NUCLEATE_OK) << r.message;
    v1::SampleReply reply;
    EXPECT_TRUE(reply.ParseFromString(r.reply));
    return reply;
  }

  // MergeSamples in the binary encoding; the status checked, the reply bytes returned.
  static std::string Merge(const v1::MergeSamplesRequest& request,
                           nucleate_status expected = NUCLEATE_OK) {
    const CallResult r = Call("MergeSamples", request.SerializeAsString(), NUCLEATE_ENCODING_BINARY);
    EXPECT_EQ(r.status, expected) << r.message;
    return r.reply;
  }

  static std::string RefusedField(const v1::MergeSamplesRequest& request) {
    v1::ErrorDetail detail;
    EXPECT_TRUE(detail.ParseFromString(Merge(request, NUCLEATE_ERROR_INVALID_ARGUMENT)));
    return detail.field();
  }

  static model::testing::TemporaryDirectory* directory_;
  static std::string* model_;
};
model::testing::TemporaryDirectory* MergeSamples::directory_ = nullptr;
std::string* MergeSamples::model_ = nullptr;

TEST_F(MergeSamples, PartsInAnyOrderGiveTheWholeRequestsReplyByteForByte) {
  const v1::SampleReply whole = Sample(0, 9, 2);
  v1::MergeSamplesRequest request;
  *request.mutable_request() = Request(0, 9, 1);
  *request.add_parts() = Sample(7, 2, 1);
  *request.add_parts() = Sample(0, 3, 2);
  *request.add_parts() = Sample(3, 4, 1);
  const std::string merged = Merge(request);
  v1::SampleReply reply;
  ASSERT_TRUE(reply.ParseFromString(merged));
  EXPECT_EQ(reply.candidates_size(), 9);
  EXPECT_EQ(reply.summary().requested(), 9);
  EXPECT_EQ(merged, whole.SerializeAsString());
}

// The same structure at sample 5 in one part and, with its atoms listed in reverse and its
// origin shifted, at sample 2 in another: one group across the parts, represented by sample 2.
TEST_F(MergeSamples, DuplicatesAcrossPartsAreGroupedAgain) {
  const v1::SampleReply source = Sample(0, 1, 1);
  ASSERT_EQ(source.candidates_size(), 1);
  ASSERT_FALSE(source.candidates(0).report().has_error());
  v1::SampleReply a, b;
  v1::Candidate* first = a.add_candidates();
  *first = source.candidates(0);
  first->set_index(5);
  v1::Candidate* second = b.add_candidates();
  *second = source.candidates(0);
  second->set_index(2);
  v1::Structure* s = second->mutable_structure();
  const int n = s->atomic_numbers_size();
  v1::Structure reversed = *s;
  for (int i = 0; i < n; ++i) {
    reversed.set_atomic_numbers(i, s->atomic_numbers(n - 1 - i));
    for (int k = 0; k < 3; ++k) {
      const double x = s->frac_coords(3 * (n - 1 - i) + k) + 0.25;
      reversed.set_frac_coords(3 * i + k, x - std::floor(x));
    }
  }
  *s = reversed;
  for (v1::SampleReply* part : {&a, &b}) {
    part->mutable_summary()->set_requested(1);
    part->mutable_summary()->set_finished(1);
  }
  b.mutable_summary()->set_cancelled(true);
  v1::MergeSamplesRequest request;
  *request.mutable_request() = Request(0, 6, 1);  // indices 0..5, only 2 and 5 finished
  *request.add_parts() = a;
  *request.add_parts() = b;
  v1::SampleReply merged;
  ASSERT_TRUE(merged.ParseFromString(Merge(request)));
  ASSERT_EQ(merged.candidates_size(), 2);
  EXPECT_EQ(merged.candidates(0).index(), 2u);
  EXPECT_EQ(merged.candidates(1).index(), 5u);
  EXPECT_EQ(merged.candidates(1).report().index(), 1);
  ASSERT_EQ(merged.groups_size(), 1);
  EXPECT_EQ(merged.groups(0).indices_size(), 2);
  EXPECT_TRUE(merged.candidates(0).representative());
  EXPECT_FALSE(merged.candidates(1).representative());
  EXPECT_EQ(merged.summary().unique(), 1);
  EXPECT_EQ(merged.summary().requested(), 6);
  EXPECT_EQ(merged.summary().finished(), 2);
  EXPECT_TRUE(merged.summary().cancelled());
  EXPECT_FALSE(merged.caution().empty());
}

TEST_F(MergeSamples, FailedCandidatesStayOutOfTheGroups) {
  v1::SampleReply part = Sample(0, 2, 1);
  v1::Candidate* failed = part.mutable_candidates(1);
  failed->clear_structure();
  failed->mutable_report()->mutable_error()->set_message("a test failure");
  part.mutable_summary()->set_failed(1);
  v1::MergeSamplesRequest request;
  *request.mutable_request() = Request(0, 2, 1);
  *request.add_parts() = part;
  v1::SampleReply merged;
  ASSERT_TRUE(merged.ParseFromString(Merge(request)));
  EXPECT_EQ(merged.candidates(1).group(), -1);
  EXPECT_FALSE(merged.candidates(1).representative());
  EXPECT_EQ(merged.summary().failed(), 1);
  EXPECT_EQ(merged.summary().unique(), 1);
}

TEST_F(MergeSamples, RefusesMissingOrOverlappingPartsNamingTheField) {
  v1::MergeSamplesRequest none;
  *none.mutable_request() = Request(0, 3, 1);
  EXPECT_EQ(RefusedField(none), "parts");
  v1::MergeSamplesRequest overlapping = none;
  *overlapping.add_parts() = Sample(0, 2, 1);
  *overlapping.add_parts() = Sample(1, 2, 1);
  EXPECT_EQ(RefusedField(overlapping), "parts[1].candidates[0].index");
  v1::MergeSamplesRequest incomplete = none;
  *incomplete.add_parts() = Sample(0, 1, 1);
  *incomplete.add_parts() = Sample(2, 1, 1);
  EXPECT_EQ(RefusedField(incomplete), "parts");
  v1::MergeSamplesRequest outside = none;
  *outside.add_parts() = Sample(2, 2, 1);
  EXPECT_EQ(RefusedField(outside), "parts[0].candidates[1].index");
  v1::MergeSamplesRequest negative = none;
  *negative.add_parts() = Sample(0, 3, 1);
  negative.mutable_request()->set_threads(-1);
  EXPECT_EQ(RefusedField(negative), "request.threads");
}

}  // namespace
}  // namespace nucleate::test
