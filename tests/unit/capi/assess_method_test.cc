// The Assess method through the C entry points, with held-out and training structures given in
// the request, on a small network with random weights saved as a model file: the reply's figures
// and their sample sizes, skipped compositions, de novo, cancellation and refusals. Structures
// from random weights mean nothing; the shape of the reply does. The configuration path is
// exercised end to end by tests/cli/assess_command_test.sh.
#include <google/protobuf/util/json_util.h>
#include <gtest/gtest.h>

#include <cmath>
#include <filesystem>
#include <string>

#include "call_helpers.h"
#include "core/model/bundle/bundle_file.h"
#include "nucleate/v1/assess.pb.h"
#include "tests/unit/bundle/bundle_fixture.h"
#include "tests/unit/sample/random_network.h"

namespace nucleate::test {
namespace {

namespace fs = std::filesystem;
namespace pb = google::protobuf;

// Primitive rock-salt NaCl (a = 5.64 A) and CsCl (a = 4.12 A), lattice constants from memory.
constexpr const char* kNaCl =
    R"({"structure": {"lattice": [0, 2.82, 2.82, 2.82, 0, 2.82, 2.82, 2.82, 0],
        "atomic_numbers": [11, 17], "frac_coords": [0, 0, 0, 0.5, 0.5, 0.5], "label": "NaCl"}})";
constexpr const char* kCsCl =
    R"({"structure": {"lattice": [4.12, 0, 0, 0, 4.12, 0, 0, 0, 4.12],
        "atomic_numbers": [55, 17], "frac_coords": [0, 0, 0, 0.5, 0.5, 0.5], "label": "CsCl"}})";

class AssessMethod : public ::testing::Test {
 protected:
  static void SetUpTestSuite() {
    // A folder of this process's own: ctest runs each test in its own process, several at once.
    directory_ = new model::testing::TemporaryDirectory;
    model::SaveModelBundle(Absorbing(),
                           sample::testing::RandomNetwork(model::SpeciesMode::kAbsorbing));
  }
  static void TearDownTestSuite() { delete directory_; }
  static std::string Absorbing() { return directory_->File("absorbing.nucleate"); }

  // A request on the absorbing model with NaCl and CsCl held out and NaCl for training.
  static std::string Request(const std::string& extra) {
    return "{\"model_path\": \"" + Absorbing() + "\", \"held_out\": [" + kNaCl + ", " + kCsCl +
           "], \"training\": [" + kNaCl + "], \"threads\": 1" + extra + "}";
  }

  static v1::AssessReply Assess(const std::string& json) {
    const CallResult r = Call("Assess", json);
    EXPECT_EQ(r.status, NUCLEATE_OK) << r.message;
    v1::AssessReply reply;
    EXPECT_TRUE(pb::util::JsonStringToMessage(r.reply, &reply).ok()) << r.reply;
    return reply;
  }

  static std::string FieldOfRefusal(const std::string& json) {
    const CallResult r = Call("Assess", json);
    EXPECT_EQ(r.status, NUCLEATE_ERROR_INVALID_ARGUMENT) << r.message;
    v1::ErrorDetail detail;
    EXPECT_TRUE(pb::util::JsonStringToMessage(r.reply, &detail).ok()) << r.reply;
    return detail.field();
  }

  static model::testing::TemporaryDirectory* directory_;
};
model::testing::TemporaryDirectory* AssessMethod::directory_ = nullptr;

void ExpectFraction(const v1::AssessFraction& f, long long total, const char* what) {
  EXPECT_EQ(f.total(), total) << what;
  EXPECT_LE(f.count(), f.total()) << what;
  if (total > 0) {
    EXPECT_EQ(f.value(), static_cast<double>(f.count()) / static_cast<double>(total)) << what;
  } else {
    EXPECT_TRUE(std::isnan(f.value())) << what;
  }
}

// Source: schemas/nucleate/v1/assess.proto (the reply's fields and what each counts).
TEST_F(AssessMethod, ReportsEveryFigureWithItsSampleSize) {
  const v1::AssessReply r =
      Assess(Request(R"(, "candidates_per_composition": 3, "de_novo_count": 4, "seed": 9)"));
  EXPECT_NE(r.caution().find("hypotheses"), std::string::npos);
  EXPECT_EQ(r.held_out_structures(), 2);
  EXPECT_EQ(r.held_out_compositions(), 2);
  EXPECT_EQ(r.training_structures(), 1);
  EXPECT_TRUE(r.dataset_hash().empty());  // given structures: nothing to verify
  // The model knows Na and Cl only: CsCl is skipped, named, and NaCl assessed against itself.
  ASSERT_EQ(r.skipped_size(), 1);
  EXPECT_EQ(r.skipped(0).formula(), "ClCs");
  EXPECT_EQ(r.skipped(0).reason(), "elements the model does not know: Cs");
  ASSERT_EQ(r.compositions_size(), 1);
  const v1::AssessComposition& row = r.compositions(0);
  EXPECT_EQ(row.formula(), "ClNa");
  EXPECT_EQ(row.target(), "NaCl");
  EXPECT_EQ(row.atoms(), 2);
  EXPECT_EQ(row.formula_units(), 1);
  EXPECT_EQ(row.finished(), 3);
  EXPECT_EQ(row.matched_any(), row.matches() > 0);
  ExpectFraction(r.matched_first(), 1, "matched_first");
  ExpectFraction(r.matched_any(), 1, "matched_any");
  EXPECT_EQ(r.best_rms().sample_size(), r.matched_any().count());
  EXPECT_EQ(std::isnan(r.best_rms().value()), r.matched_any().count() == 0);

  const v1::AssessCandidateFigures& p = r.prediction();
  EXPECT_EQ(p.requested(), 3);
  EXPECT_EQ(p.finished(), 3);
  const long long produced = p.finished() - p.failed();
  ExpectFraction(p.valid(), 3, "valid");
  ExpectFraction(p.symmetric(), produced, "symmetric");
  ExpectFraction(p.unique(), produced, "unique");
  ExpectFraction(p.novel(), produced, "novel");
  EXPECT_EQ(p.charge_neutral().total() + p.charge_not_applicable(), produced);
  EXPECT_EQ(p.density().reference(), 1);  // the one target cell
  EXPECT_EQ(p.density().candidates(), produced);

  ASSERT_TRUE(r.de_novo_run());
  EXPECT_EQ(r.de_novo().requested(), 4);
  EXPECT_EQ(r.de_novo().finished(), 4);
  ExpectFraction(r.de_novo().valid(), 4, "de novo valid");
  EXPECT_EQ(r.de_novo().density().reference(), 2);  // the whole held-out set
  EXPECT_GT(r.evaluations(), 0);
  EXPECT_FALSE(r.cancelled());
}

int32_t CancelAtHalf(double fraction, const char*, void*) { return fraction >= 0.5 ? 1 : 0; }

// Cancelling keeps the figures of what finished and says so: one thread, cancelled at half of
// the one composition's 4 candidates, leaves it unfinished, so no composition is kept.
TEST_F(AssessMethod, CancellationRepliesWithTheFiguresOfWhatFinished) {
  const std::string json = Request(R"(, "candidates_per_composition": 4)");
  void* reply = nullptr;
  size_t size = 0;
  char* message = nullptr;
  const nucleate_status status =
      nucleate_call_observed("Assess", json.data(), json.size(), NUCLEATE_ENCODING_JSON, nullptr,
                             &CancelAtHalf, nullptr, &reply, &size, &message);
  EXPECT_EQ(status, NUCLEATE_ERROR_CANCELLED) << (message ? message : "");
  v1::AssessReply r;
  ASSERT_TRUE(pb::util::JsonStringToMessage(std::string(static_cast<char*>(reply), size), &r).ok());
  nucleate_free(reply);
  nucleate_free(message);
  EXPECT_TRUE(r.cancelled());
  EXPECT_EQ(r.compositions_size(), 0);
  EXPECT_EQ(r.matched_any().total(), 0);
  ASSERT_GT(r.notes_size(), 0);
  EXPECT_NE(r.notes(r.notes_size() - 1).find("cancelled"), std::string::npos);
}

// Source: assess.proto, AssessRequest: exactly one of config_yaml and held_out; training only
// with held_out.
TEST_F(AssessMethod, RefusesRequestsNamingTheField) {
  EXPECT_EQ(FieldOfRefusal(R"({"model_path": "m.nucleate"})"), "config_yaml");
  EXPECT_EQ(FieldOfRefusal(std::string(R"({"model_path": "m.nucleate", "config_yaml": "data: {}",
                                          "held_out": [)") +
                           kNaCl + "]}"),
            "held_out");
  EXPECT_EQ(FieldOfRefusal(std::string(R"({"model_path": "m.nucleate", "config_yaml": "data: {}",
                                          "training": [)") +
                           kNaCl + "]}"),
            "training");
  // A held-out structure with 8 lattice numbers, named by its place in the request.
  EXPECT_EQ(FieldOfRefusal(std::string(R"({"model_path": "m.nucleate", "held_out": [)") + kNaCl +
                           R"(, {"structure": {"lattice": [1, 0, 0, 0, 1, 0, 0, 0],
                                 "atomic_numbers": [11], "frac_coords": [0, 0, 0]}}]})"),
            "held_out[1].structure.lattice");
  EXPECT_EQ(FieldOfRefusal(Request(R"(, "compositions": 0)")), "compositions");
  EXPECT_EQ(FieldOfRefusal(Request(R"(, "min_distance": -1)")), "min_distance");
  EXPECT_EQ(FieldOfRefusal(Request(R"(, "tolerances": {"angle_tolerance": 50})")),
            "tolerances.angle_tolerance");
  EXPECT_EQ(FieldOfRefusal(Request(R"(, "sampler": {"steps": 51})")), "sampler.steps");
}

}  // namespace
}  // namespace nucleate::test
