// Bad input gets a specific status and a message naming the field; nothing crashes.
#include <cstring>
#include <random>

#include <gtest/gtest.h>

#include <google/protobuf/util/json_util.h>

#include "call_helpers.h"
#include "dispatch.h"
#include "nucleate/v1/error.pb.h"

namespace nucleate::test {
namespace {

struct BadCase {
  const char* method;
  const char* request;
  nucleate_status status;
  const char* must_mention;  // the field or fact the message must name
};

class BadRequest : public testing::TestWithParam<BadCase> {};

TEST_P(BadRequest, IsRefusedWithItsStatusAndNamesTheField) {
  const BadCase& c = GetParam();
  const CallResult result = Call(c.method, c.request);
  EXPECT_EQ(result.status, c.status) << nucleate_status_name(result.status) << ": "
                                     << result.message;
  EXPECT_NE(result.message.find(c.must_mention), std::string::npos) << result.message;
  EXPECT_EQ(result.message.find('\n'), std::string::npos) << "message must be one line";
}

INSTANTIATE_TEST_SUITE_P(
    Schedule, BadRequest,
    testing::Values(
        BadCase{"Nope", "{}", NUCLEATE_ERROR_UNKNOWN_METHOD, "Nope"},
        BadCase{"Schedule", "{", NUCLEATE_ERROR_MALFORMED_REQUEST, "ScheduleRequest"},
        BadCase{"Schedule", R"({"variance":{"steps":"many"}})", NUCLEATE_ERROR_MALFORMED_REQUEST,
                "variance.steps"},
        BadCase{"Schedule", R"({"variance":{"stepz":10}})", NUCLEATE_ERROR_MALFORMED_REQUEST,
                "stepz"},
        BadCase{"Schedule", "{}", NUCLEATE_ERROR_INVALID_ARGUMENT, "family"},
        BadCase{"Schedule", R"({"variance":{"steps":0}})", NUCLEATE_ERROR_INVALID_ARGUMENT,
                "variance.steps"},
        BadCase{"Schedule", R"({"variance":{"steps":-3}})", NUCLEATE_ERROR_INVALID_ARGUMENT,
                "variance.steps"},
        BadCase{"Schedule", R"({"variance":{"steps":100001}})", NUCLEATE_ERROR_LIMIT_EXCEEDED,
                "variance.steps"},
        BadCase{"Schedule", R"({"variance":{"beta_end":"NaN"}})",
                NUCLEATE_ERROR_INVALID_ARGUMENT, "variance.beta_end"},
        BadCase{"Schedule", R"({"variance":{"beta_start":-0.1}})",
                NUCLEATE_ERROR_INVALID_ARGUMENT, "variance.beta_start"},
        BadCase{"Schedule", R"({"variance":{"beta_start":0.5,"beta_end":0.1}})",
                NUCLEATE_ERROR_INVALID_ARGUMENT, "variance.beta"},
        BadCase{"Schedule", R"({"variance":{"respaced_steps":2000}})",
                NUCLEATE_ERROR_INVALID_ARGUMENT, "variance.respaced_steps"},
        BadCase{"Schedule", R"({"sigma":{"sigma_min":0.5,"sigma_max":0.1}})",
                NUCLEATE_ERROR_INVALID_ARGUMENT, "sigma.sigma_m"},
        BadCase{"Schedule", R"({"sigma":{"sigma_min":"-Infinity"}})",
                NUCLEATE_ERROR_INVALID_ARGUMENT, "sigma.sigma_min"},
        BadCase{"Schedule", R"({"transition":{"num_classes":1}})",
                NUCLEATE_ERROR_INVALID_ARGUMENT, "transition.num_classes"},
        BadCase{"Schedule",
                R"({"transition":{"num_classes":256,"steps":1000,"include_matrices":true}})",
                NUCLEATE_ERROR_LIMIT_EXCEEDED, "transition.include_matrices"},
        BadCase{"Schedule", R"({"variance":{},"limits":{"max_steps":0}})",
                NUCLEATE_ERROR_INVALID_ARGUMENT, "limits.max_steps"},
        BadCase{"Schedule", R"({"variance":{},"limits":{"max_steps":100000000}})",
                NUCLEATE_ERROR_LIMIT_EXCEEDED, "limits.max_steps"},
        BadCase{"WrappedNormal", R"({"sigma":0})", NUCLEATE_ERROR_INVALID_ARGUMENT, "sigma"},
        BadCase{"WrappedNormal", R"({"sigma":0.1,"x":[0.1,"NaN"]})",
                NUCLEATE_ERROR_INVALID_ARGUMENT, "x[1]"},
        BadCase{"DesignSchedule", R"({"terminal_snr":-1})", NUCLEATE_ERROR_INVALID_ARGUMENT,
                "terminal_snr"},
        BadCase{"DesignSchedule", R"({"resolution_angstrom":"NaN"})",
                NUCLEATE_ERROR_INVALID_ARGUMENT, "resolution_angstrom"}));

// Train and ModelInfo: configuration mistakes name the key and line; model files that are
// missing or not model files name the path.
INSTANTIATE_TEST_SUITE_P(
    Model, BadRequest,
    testing::Values(
        BadCase{"Train", R"({"config_yaml":"","config_name":"t.yaml"})",
                NUCLEATE_ERROR_INVALID_ARGUMENT, "t.yaml"},
        BadCase{"Train",
                R"({"config_yaml":"data: {directory: d}\noutput: {model: m}\ntraining: {epochz: 2}\n","config_name":"t.yaml"})",
                NUCLEATE_ERROR_INVALID_ARGUMENT, "t.yaml:3: training.epochz"},
        BadCase{"Train",
                R"({"config_yaml":"data: {directory: /nonexistent/nucleate/dir}\noutput: {model: m}\n"})",
                NUCLEATE_ERROR_IO, "/nonexistent/nucleate/dir"},
        BadCase{"ModelInfo", "{}", NUCLEATE_ERROR_INVALID_ARGUMENT, "path"},
        BadCase{"ModelInfo", R"({"path":"/nonexistent/model.nucleate"})", NUCLEATE_ERROR_IO,
                "/nonexistent/model.nucleate"},
        BadCase{"ModelInfo", R"({"path":"/etc/passwd"})", NUCLEATE_ERROR_INVALID_ARGUMENT,
                "/etc/passwd"},
        BadCase{"Evaluate", "{}", NUCLEATE_ERROR_INVALID_ARGUMENT, "model_path"},
        BadCase{"Evaluate", R"({"model_path":"/nonexistent/model.nucleate"})", NUCLEATE_ERROR_IO,
                "/nonexistent/model.nucleate"},
        BadCase{"Evaluate",
                R"({"model_path":"m","cells":[{"structure":{"lattice":[1,0,0],"atomic_numbers":[8],"frac_coords":[0,0,0]}}]})",
                NUCLEATE_ERROR_INVALID_ARGUMENT, "cells[0].structure"}));

// Sample: everything a request can get wrong is refused before the model file is opened, so these
// need no model (the path below does not exist; only the last case gets as far as opening it).
INSTANTIATE_TEST_SUITE_P(
    Sample, BadRequest,
    testing::Values(
        BadCase{"Sample", R"({"composition":{"formula":"NaCl"}})", NUCLEATE_ERROR_INVALID_ARGUMENT,
                "model_path"},
        BadCase{"Sample", R"({"model_path":"/nonexistent/model.nucleate"})",
                NUCLEATE_ERROR_INVALID_ARGUMENT, "task"},
        BadCase{"Sample",
                R"({"model_path":"/nonexistent/model.nucleate","composition":{"formula":"Xx2O"}})",
                NUCLEATE_ERROR_INVALID_ARGUMENT, "composition.formula: unknown element 'Xx'"},
        BadCase{"Sample",
                R"({"model_path":"/nonexistent/model.nucleate","composition":{"formula":"Na(Cl"}})",
                NUCLEATE_ERROR_INVALID_ARGUMENT, "composition.formula: missing ')'"},
        BadCase{"Sample",
                R"({"model_path":"/nonexistent/model.nucleate","composition":{"formula":""}})",
                NUCLEATE_ERROR_INVALID_ARGUMENT, "composition.formula: no elements"},
        BadCase{"Sample",
                R"({"model_path":"/nonexistent/model.nucleate","composition":{"formula":"NaCl"},"seed":-1})",
                NUCLEATE_ERROR_MALFORMED_REQUEST, "seed"},
        BadCase{"Sample",
                R"({"model_path":"/nonexistent/model.nucleate","composition":{"formula":"NaCl"},"sampler":{"kind":99}})",
                NUCLEATE_ERROR_INVALID_ARGUMENT, "sampler.kind"},
        BadCase{"Sample",
                R"({"model_path":"/nonexistent/model.nucleate","composition":{"formula":"NaCl"},"sampler":{"ddpm_variance":7}})",
                NUCLEATE_ERROR_INVALID_ARGUMENT, "sampler.ddpm_variance"},
        BadCase{"Sample",
                R"({"model_path":"/nonexistent/model.nucleate","composition":{"formula":"NaCl"},"symprec":-1})",
                NUCLEATE_ERROR_INVALID_ARGUMENT, "symprec"},
        BadCase{"Sample",
                R"({"model_path":"/nonexistent/model.nucleate","composition":{"formula":"NaCl"},"thresholds":{"min_distance":-1}})",
                NUCLEATE_ERROR_INVALID_ARGUMENT, "thresholds.min_distance"},
        BadCase{"Sample",
                R"({"model_path":"/nonexistent/model.nucleate","composition":{"formula":"NaCl"},"tolerances":{"length_tolerance":-1}})",
                NUCLEATE_ERROR_INVALID_ARGUMENT, "tolerances.length_tolerance"},
        BadCase{"Sample",
                R"({"model_path":"/nonexistent/model.nucleate","composition":{"formula":"NaCl"},"limits":{"max_atoms":0}})",
                NUCLEATE_ERROR_INVALID_ARGUMENT, "limits.max_atoms"},
        BadCase{"Sample",
                R"({"model_path":"/nonexistent/model.nucleate","composition":{"formula":"NaCl"},"limits":{"max_count":0}})",
                NUCLEATE_ERROR_INVALID_ARGUMENT, "limits.max_count"},
        BadCase{"Sample",
                R"({"model_path":"/nonexistent/model.nucleate","composition":{"formula":"NaCl"},"limits":{"max_evaluations":0}})",
                NUCLEATE_ERROR_INVALID_ARGUMENT, "limits.max_evaluations"},
        BadCase{"Sample", R"({"model_path":"/nonexistent/model.nucleate","variation":{}})",
                NUCLEATE_ERROR_INVALID_ARGUMENT, "variation.structure"},
        BadCase{"Sample",
                R"({"model_path":"/nonexistent/model.nucleate","constrained":{"structure":{"structure":{"lattice":[1,0,0],"atomic_numbers":[8],"frac_coords":[0,0,0]}}}})",
                NUCLEATE_ERROR_INVALID_ARGUMENT, "constrained.structure.structure.lattice"},
        BadCase{"Sample",
                R"({"model_path":"/nonexistent/model.nucleate","composition":{"formula":"NaCl"}})",
                NUCLEATE_ERROR_IO, "/nonexistent/model.nucleate"}));

TEST(BadArguments, NullPointersAndBadEncodingsAreRefused) {
  void* reply = nullptr;
  size_t size = 0;
  char* message = nullptr;
  EXPECT_EQ(nucleate_call("Version", "{}", 2, NUCLEATE_ENCODING_JSON, nullptr, &size, &message),
            NUCLEATE_ERROR_NULL_ARGUMENT);
  EXPECT_EQ(nucleate_call("Version", "{}", 2, NUCLEATE_ENCODING_JSON, &reply, nullptr, &message),
            NUCLEATE_ERROR_NULL_ARGUMENT);
  EXPECT_EQ(reply, nullptr) << "out-parameters stay untouched";

  EXPECT_EQ(nucleate_call(nullptr, "{}", 2, NUCLEATE_ENCODING_JSON, &reply, &size, &message),
            NUCLEATE_ERROR_NULL_ARGUMENT);
  nucleate_free(reply);
  nucleate_free(message);

  EXPECT_EQ(nucleate_call("Version", nullptr, 5, NUCLEATE_ENCODING_JSON, &reply, &size, &message),
            NUCLEATE_ERROR_NULL_ARGUMENT);
  nucleate_free(reply);
  nucleate_free(message);

  EXPECT_EQ(nucleate_call("Version", "{}", 2, 7, &reply, &size, &message),
            NUCLEATE_ERROR_BAD_ENCODING);
  EXPECT_NE(std::string(message).find("encoding 7"), std::string::npos) << message;
  nucleate_free(reply);
  nucleate_free(message);

  // An empty binary request is the empty message, which is valid for Version.
  ASSERT_EQ(nucleate_call("Version", nullptr, 0, NUCLEATE_ENCODING_BINARY, &reply, &size, nullptr),
            NUCLEATE_OK);
  nucleate_free(reply);
}

// A model file that cannot be read is reported against the request field that named it, with the
// path in the message: the caller learns which field to change (not a path to look for).
TEST(BadModelFile, ErrorNamesTheRequestFieldAndThePath) {
  const struct {
    const char* method;
    const char* request;
    const char* field;
    nucleate_status status;
  } cases[] = {
      {"ModelInfo", R"({"path":"/nonexistent/m.nucleate"})", "path", NUCLEATE_ERROR_IO},
      {"ModelInfo", R"({"path":"/etc/hostname"})", "path", NUCLEATE_ERROR_INVALID_ARGUMENT},
      {"Evaluate", R"({"model_path":"/nonexistent/m.nucleate"})", "model_path", NUCLEATE_ERROR_IO},
      {"Sample", R"({"model_path":"/nonexistent/m.nucleate","composition":{"formula":"NaCl"}})",
       "model_path", NUCLEATE_ERROR_IO},
  };
  for (const auto& c : cases) {
    const CallResult r = Call(c.method, c.request);
    EXPECT_EQ(r.status, c.status) << c.method << ": " << r.message;
    v1::ErrorDetail detail;
    ASSERT_TRUE(google::protobuf::util::JsonStringToMessage(r.reply, &detail).ok()) << r.reply;
    EXPECT_EQ(detail.field(), c.field) << r.message;
    EXPECT_NE(r.message.find(std::string(c.field) + ": /"), std::string::npos) << r.message;
  }
}

TEST(BadArguments, StatusNamesAreStableAndUnknownCodesAreNamedSo) {
  EXPECT_STREQ(nucleate_status_name(NUCLEATE_OK), "NUCLEATE_OK");
  EXPECT_STREQ(nucleate_status_name(NUCLEATE_ERROR_UNSUPPORTED), "NUCLEATE_ERROR_UNSUPPORTED");
  EXPECT_STREQ(nucleate_status_name(NUCLEATE_ERROR_COLLECTIVE), "NUCLEATE_ERROR_COLLECTIVE");
  EXPECT_STREQ(nucleate_status_name(-1), "NUCLEATE_STATUS_UNKNOWN");
  EXPECT_STREQ(nucleate_status_name(9999), "NUCLEATE_STATUS_UNKNOWN");
}

// A short random-bytes run over every method and both encodings: each call must come back with
// a status and, on failure, a message. Long fuzzing runs live in their own scripts.
TEST(RandomBytes, NeverCrashAndAlwaysExplain) {
  std::mt19937_64 random(20261202);
  std::uniform_int_distribution<int> byte(0, 255), length(0, 96);
  const char* json_alphabet = "{}[]\":,0123456789.-eE truefalsnul\\variance_stepsigma";
  const size_t alphabet_size = std::strlen(json_alphabet);
  int calls = 0, ok = 0;
  for (const capi::MethodEntry& method : capi::Methods()) {
    for (int round = 0; round < 400; ++round) {
      std::string bytes(static_cast<size_t>(length(random)), '\0');
      const bool json = round % 2 == 1;
      for (char& c : bytes) {
        c = json ? json_alphabet[static_cast<size_t>(byte(random)) % alphabet_size]
                 : static_cast<char>(byte(random));
      }
      const CallResult result =
          Call(method.name, bytes, json ? NUCLEATE_ENCODING_JSON : NUCLEATE_ENCODING_BINARY);
      ++calls;
      if (result.status == NUCLEATE_OK) {
        ++ok;
      } else {
        EXPECT_FALSE(result.message.empty()) << method.name;
        EXPECT_NE(result.status, NUCLEATE_ERROR_INTERNAL) << method.name << ": " << result.message;
      }
    }
  }
  EXPECT_EQ(calls, 400 * static_cast<int>(capi::Methods().size()));
  RecordProperty("accepted", ok);
}

}  // namespace
}  // namespace nucleate::test
