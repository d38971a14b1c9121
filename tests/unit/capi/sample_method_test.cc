// The Sample method through the C entry points, on a small network with random weights saved as
// a model file: every task, the reply's reports, groups and summary, encodings, request splits
// and cancellation. Structures from random weights mean nothing; the shape of the reply does.
#include <filesystem>
#include <set>
#include <string>

#include <google/protobuf/util/json_util.h>
#include <gtest/gtest.h>

#include "call_helpers.h"
#include "core/model/bundle/bundle_file.h"
#include "nucleate/v1/sample.pb.h"
#include "tests/unit/bundle/bundle_fixture.h"
#include "tests/unit/sample/random_network.h"

namespace nucleate::test {
namespace {

namespace fs = std::filesystem;
namespace pb = google::protobuf;

class SampleMethod : public ::testing::Test {
 protected:
  static void SetUpTestSuite() {
    // A folder of this process's own: ctest runs each test in its own process, several at once.
    directory_ = new model::testing::TemporaryDirectory;
    dir_ = new fs::path(directory_->path());
    model::SaveModelBundle(Given(), sample::testing::RandomNetwork());
    model::SaveModelBundle(Absorbing(),
                           sample::testing::RandomNetwork(model::SpeciesMode::kAbsorbing));
  }
  static void TearDownTestSuite() {
    delete dir_;
    delete directory_;
  }
  static std::string Given() { return (*dir_ / "given.nucleate").string(); }
  static std::string Absorbing() { return (*dir_ / "absorbing.nucleate").string(); }

  // Calls Sample with a JSON request; the reply parsed, the status checked.
  static v1::SampleReply Sample(const std::string& json, nucleate_status expected = NUCLEATE_OK) {
    const CallResult r = Call("Sample", json);
    EXPECT_EQ(r.status, expected) << r.message;
    v1::SampleReply reply;
    EXPECT_TRUE(pb::util::JsonStringToMessage(r.reply, &reply).ok()) << r.reply;
    return reply;
  }

  static model::testing::TemporaryDirectory* directory_;
  static fs::path* dir_;
};
model::testing::TemporaryDirectory* SampleMethod::directory_ = nullptr;
fs::path* SampleMethod::dir_ = nullptr;

// Every finished candidate is in exactly one group, each group has one representative (its
// first index), and the summary counts agree with the candidates.
void ExpectConsistent(const v1::SampleReply& r, int count) {
  EXPECT_FALSE(r.caution().empty());
  EXPECT_EQ(r.summary().requested(), count);
  EXPECT_EQ(r.summary().finished(), r.candidates_size());
  int failed = 0, valid = 0, representatives = 0;
  std::set<unsigned> grouped;
  for (const v1::CandidateGroup& g : r.groups()) {
    for (unsigned index : g.indices()) EXPECT_TRUE(grouped.insert(index).second);
  }
  for (const v1::Candidate& c : r.candidates()) {
    EXPECT_EQ(c.report().source(), "sample-" + std::to_string(c.index()));
    if (c.report().has_error()) {
      ++failed;
      EXPECT_EQ(c.group(), -1);
      continue;
    }
    valid += c.report().valid();
    representatives += c.representative();
    ASSERT_GE(c.group(), 0);
    ASSERT_LT(c.group(), r.groups_size());
    EXPECT_EQ(c.representative(), r.groups(c.group()).indices(0) == c.index());
    EXPECT_EQ(c.structure().atomic_numbers_size(), c.report().num_atoms());
    EXPECT_FALSE(c.report().formula().empty());
  }
  EXPECT_EQ(r.summary().failed(), failed);
  EXPECT_EQ(r.summary().valid(), valid);
  EXPECT_EQ(r.summary().unique(), r.groups_size());
  EXPECT_EQ(representatives, r.groups_size());
  EXPECT_EQ(static_cast<int>(grouped.size()), r.candidates_size() - failed);
}

const char* kNaClCell =
    R"({"structure": {"lattice": [0, 2.82, 2.82, 2.82, 0, 2.82, 2.82, 2.82, 0],
        "atomic_numbers": [11, 17], "frac_coords": [0.125, 0.25, 0.375, 0.625, 0.75, 0.875]}})";

TEST_F(SampleMethod, EveryTaskRunsThroughTheCAbi) {
  const std::string model = "\"model_path\": \"" + Given() + "\"";
  const std::string tasks[] = {
      R"("composition": {"formula": "NaCl", "min_formula_units": 1, "max_formula_units": 2})",
      R"("composition": {"formula": "NaCl"}, "conditions": {"crystal_system": 7, "guidance": 2})",
      std::string(R"("variation": {"structure": )") + kNaClCell + R"(, "strength": 0.4})",
      std::string(R"("constrained": {"structure": )") + kNaClCell +
          R"(, "fixed_atoms": [0], "fix_lattice": true, "added_atoms": [11, 17]})",
  };
  for (const std::string& task : tasks) {
    SCOPED_TRACE(task);
    const v1::SampleReply r = Sample("{" + model + ", " + task + R"(, "count": 3, "seed": 4})");
    ExpectConsistent(r, 3);
    EXPECT_EQ(r.candidates_size(), 3);
  }
  // The constrained task keeps the fixed atom's coordinates and the cell bit for bit (the
  // structure message round-trips doubles exactly through JSON).
  const v1::SampleReply constrained = Sample("{" + model + ", " + tasks[3] + R"(, "count": 2})");
  for (const v1::Candidate& c : constrained.candidates()) {
    ASSERT_EQ(c.structure().atomic_numbers_size(), 4);
    EXPECT_EQ(c.structure().frac_coords(0), 0.125);
    EXPECT_EQ(c.structure().frac_coords(1), 0.25);
    EXPECT_EQ(c.structure().frac_coords(2), 0.375);
    EXPECT_EQ(c.structure().lattice(1), 2.82);
    EXPECT_EQ(c.structure().lattice(0), 0.0);
  }
  // De novo needs the model that generates species.
  const v1::SampleReply de_novo = Sample("{\"model_path\": \"" + Absorbing() +
                                         R"(", "de_novo": {"allowed_elements": [17]}, "count": 2})");
  ExpectConsistent(de_novo, 2);
  for (const v1::Candidate& c : de_novo.candidates()) {
    for (int z : c.structure().atomic_numbers()) EXPECT_EQ(z, 17);
  }
}

TEST_F(SampleMethod, SplitsAndEncodingsGiveTheSameCandidates) {
  const std::string head = "{\"model_path\": \"" + Given() + R"(", "composition": {"formula": "NaCl"}, "seed": 8, )";
  const v1::SampleReply whole = Sample(head + R"("count": 4, "threads": 2})");
  const v1::SampleReply part = Sample(head + R"("first_index": 2, "count": 2, "threads": 1})");
  ASSERT_EQ(part.candidates_size(), 2);
  for (int i = 0; i < 2; ++i) {
    EXPECT_EQ(part.candidates(i).index(), whole.candidates(i + 2).index());
    EXPECT_EQ(part.candidates(i).structure().SerializeAsString(),
              whole.candidates(i + 2).structure().SerializeAsString());
  }
  v1::SampleRequest request;
  ASSERT_TRUE(pb::util::JsonStringToMessage(head + R"("count": 4, "threads": 2})", &request).ok());
  const CallResult binary = Call("Sample", request.SerializeAsString(), NUCLEATE_ENCODING_BINARY);
  ASSERT_EQ(binary.status, NUCLEATE_OK) << binary.message;
  v1::SampleReply from_binary;
  ASSERT_TRUE(from_binary.ParseFromString(binary.reply));
  EXPECT_EQ(from_binary.SerializeAsString(), whole.SerializeAsString());
}

TEST_F(SampleMethod, SymmetrisedCandidatesComeWithTheirSpaceGroup) {
  const v1::SampleReply r = Sample("{\"model_path\": \"" + Given() +
                                   R"(", "composition": {"formula": "NaCl"}, "count": 3,
                                   "symmetrise": true, "symprec": 0.5})");
  for (const v1::Candidate& c : r.candidates()) {
    EXPECT_EQ(c.has_symmetrised(), c.report().space_group_number() > 0) << c.index();
  }
}

int32_t CancelAtHalf(double fraction, const char*, void* calls) {
  ++*static_cast<int*>(calls);
  return fraction >= 0.5 ? 1 : 0;
}

// One thread runs the 12 samples one after another (50 steps each, a report after every step):
// cancelling at half keeps the first 6, finished exactly then, and reports CANCELLED with them.
TEST_F(SampleMethod, CancellationReturnsTheFinishedCandidates) {
  const std::string json = "{\"model_path\": \"" + Given() +
                           R"(", "composition": {"formula": "NaCl"}, "count": 12, "threads": 1})";
  int calls = 0;
  void* reply = nullptr;
  size_t size = 0;
  char* message = nullptr;
  const nucleate_status status =
      nucleate_call_observed("Sample", json.data(), json.size(), NUCLEATE_ENCODING_JSON, nullptr,
                             &CancelAtHalf, &calls, &reply, &size, &message);
  EXPECT_EQ(status, NUCLEATE_ERROR_CANCELLED) << (message ? message : "");
  v1::SampleReply r;
  ASSERT_TRUE(pb::util::JsonStringToMessage(std::string(static_cast<char*>(reply), size), &r).ok());
  nucleate_free(reply);
  nucleate_free(message);
  EXPECT_TRUE(r.summary().cancelled());
  EXPECT_EQ(r.candidates_size(), 6);
  EXPECT_EQ(calls, 12 * 50 / 2);
}

}  // namespace
}  // namespace nucleate::test
