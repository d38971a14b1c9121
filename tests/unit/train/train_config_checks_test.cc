// The training configuration's checks made before any work: repeated keys, unclosed quotes, the
// model and diffusion settings (checked before the data are read), the thread ceiling, the file as
// a whole, and errors of the data named by the configuration key that set them. The contract is
// core/train/CONFIG.md: "An unknown key, a value of the wrong type or out of range stops the run
// before any work, with the file, line and key path in the message".
#include <gtest/gtest.h>

#include <string>

#include "core/common/error.h"
#include "core/train/train_config.h"
#include "core/train/trainer.h"
#include "tests/unit/train/config_test_support.h"

namespace nucleate::train {
namespace {

using testing::ErrorOf;
using testing::kMinimal;

bool Mentions(const Error& e, const std::string& words) {
  return std::string(e.what()).find(words) != std::string::npos;
}

// ---- repeated keys: YAML 1.2 (yaml.org), section 3.2.1.1: "the keys are unique" in a mapping
// (from memory). yaml-cpp keeps both entries and finds the first, so the reader refuses the second.

TEST(TrainConfigChecks, RepeatedKeyIsRefusedAtItsSecondLine) {
  const Error e = ErrorOf(std::string(kMinimal) + "training:\n  epochs: 1\n  epochs: 5\n");
  EXPECT_EQ(e.kind(), ErrorKind::kInvalidArgument);
  EXPECT_EQ(e.field(), "train.yaml:7: training.epochs") << e.what();
  EXPECT_TRUE(Mentions(e, "first on line 6")) << e.what();
}

TEST(TrainConfigChecks, RepeatedSectionIsRefusedAtItsSecondLine) {
  const Error e = ErrorOf(std::string(kMinimal) + "output: {model: other.nucleate}\n");
  EXPECT_EQ(e.field(), "train.yaml:5: output") << e.what();
  EXPECT_TRUE(Mentions(e, "first on line 3")) << e.what();
}

TEST(TrainConfigChecks, RepeatedKeyInsideAFlowMappingIsRefused) {
  const Error e = ErrorOf(std::string(kMinimal) + "split: {test_fraction: 0.1, test_fraction: 0.2}\n");
  EXPECT_EQ(e.field(), "train.yaml:5: split.test_fraction") << e.what();
}

// ---- quoted scalars: YAML 1.2, sections 7.3.1 and 7.3.2: a double-quoted scalar ends at an
// unescaped '"' (backslash escapes), a single-quoted one at a ' not doubled ('' is one quote)
// (from memory).

TEST(TrainConfigChecks, UnclosedDoubleQuoteIsNotValidYaml) {
  const Error e = ErrorOf("data: {directory: d}\noutput:\n  model: \"m.nucleate\n");
  EXPECT_EQ(e.kind(), ErrorKind::kInvalidArgument);
  EXPECT_EQ(e.field(), "train.yaml:3") << e.what();
  EXPECT_TRUE(Mentions(e, "not valid YAML")) << e.what();
  EXPECT_TRUE(Mentions(e, "line 3, column 10 is never closed")) << e.what();
}

TEST(TrainConfigChecks, UnclosedSingleQuoteIsNotValidYaml) {
  const Error e = ErrorOf("data: {directory: d}\noutput:\n  model: 'm.nucleate\n");
  EXPECT_EQ(e.field(), "train.yaml:3") << e.what();
  EXPECT_TRUE(Mentions(e, "not valid YAML")) << e.what();
}

TEST(TrainConfigChecks, UnclosedQuoteAfterAnAnchorIsFound) {
  const Error e = ErrorOf("data: {directory: d}\noutput:\n  model: &name \"m.nucleate\n");
  EXPECT_EQ(e.field(), "train.yaml:3") << e.what();
  EXPECT_TRUE(Mentions(e, "never closed")) << e.what();
}

TEST(TrainConfigChecks, UnclosedQuoteAfterAByteOrderMarkIsFound) {
  // yaml-cpp drops a UTF-8 byte order mark and counts its marks from after it.
  const Error e = ErrorOf("\xEF\xBB\xBF" "data: {directory: d}\noutput:\n  model: \"m\n");
  EXPECT_EQ(e.field(), "train.yaml:3") << e.what();
  EXPECT_TRUE(Mentions(e, "never closed")) << e.what();
}

TEST(TrainConfigChecks, ClosedQuotesWithEscapesAreRead) {
  // An escaped quote, a doubled single quote, a byte order mark and a two-byte character before
  // them: none of these is an unclosed quote.
  const TrainSettings s = ReadTrainConfig(
      "\xEF\xBB\xBF" "data: {directory: \"caf\xC3\xA9 \\\"a\\\"\", properties_csv: 'it''s.csv'}\n"
      "output: {model: \"m.nucleate\"}\n",
      "", "train.yaml");
  EXPECT_EQ(s.data.directory, "caf\xC3\xA9 \"a\"");
  EXPECT_EQ(s.data.properties_csv, "it's.csv");
  EXPECT_EQ(s.output.model, "m.nucleate");
}

// ---- model and diffusion settings, before the data. Ranges: core/model/architecture.h
// (ValidateArchitecture) and CONFIG.md; the directory "structures" does not exist, so only a check
// made while reading can produce these errors.

TEST(TrainConfigChecks, ModelSettingsAreCheckedWithTheirLine) {
  Error e = ErrorOf(std::string(kMinimal) + "model:\n  hidden: 0\n");
  EXPECT_EQ(e.kind(), ErrorKind::kInvalidArgument);
  EXPECT_EQ(e.field(), "train.yaml:6: model.hidden") << e.what();
  e = ErrorOf(std::string(kMinimal) + "model:\n  layers: 2\n  radial_max: -3.0\n");
  EXPECT_EQ(e.field(), "train.yaml:7: model.radial_max") << e.what();
  e = ErrorOf(std::string(kMinimal) + "model:\n  cutoff_from_atoms: 1\n");
  EXPECT_EQ(e.field(), "train.yaml:6: model.cutoff_from_atoms") << e.what();
  e = ErrorOf(std::string(kMinimal) + "model: {cutoff: 0}\n");
  EXPECT_EQ(e.field(), "train.yaml:5: model.cutoff") << e.what();
}

TEST(TrainConfigChecks, TimeEmbeddingWidthMustBeEven) {
  // A sinusoidal embedding pairs a sine with a cosine of each frequency (Vaswani et al. 2017,
  // "Attention is all you need", section 3.5; from memory), so its width is even.
  const Error e = ErrorOf(std::string(kMinimal) + "model:\n  time_embedding: 31\n");
  EXPECT_EQ(e.field(), "train.yaml:6: model.time_embedding") << e.what();
  EXPECT_TRUE(Mentions(e, "must be even")) << e.what();
  EXPECT_NO_THROW(ReadTrainConfig(std::string(kMinimal) + "model:\n  time_embedding: 30\n", "",
                                  "train.yaml"));
}

TEST(TrainConfigChecks, RepeatedPropertyNamesPointAtTheRepeat) {
  // Property names become the model's; each names one input (CONFIG.md, data.properties).
  const Error e = ErrorOf(
      "data:\n  directory: d\n  properties:\n    - band_gap\n    - band_gap\noutput: {model: m}\n");
  EXPECT_EQ(e.field(), "train.yaml:5: data.properties[1]") << e.what();
  EXPECT_TRUE(Mentions(e, "band_gap")) << e.what();
}

TEST(TrainConfigChecks, DiffusionStepsAboveTheScheduleLimitAreALimit) {
  // max_steps = 100000 by default (schemas/nucleate/v1/schedule.proto, core/schedule/limits.h).
  Error e = ErrorOf(std::string(kMinimal) + "diffusion:\n  steps: 100000000000\n");
  EXPECT_EQ(e.kind(), ErrorKind::kLimitExceeded) << e.what();
  EXPECT_EQ(e.field(), "train.yaml:6: diffusion.steps") << e.what();
  e = ErrorOf(std::string(kMinimal) + "diffusion:\n  steps: 100001\n");
  EXPECT_EQ(e.kind(), ErrorKind::kLimitExceeded) << e.what();
  EXPECT_NO_THROW(
      ReadTrainConfig(std::string(kMinimal) + "diffusion:\n  steps: 100000\n", "", "train.yaml"));
}

TEST(TrainConfigChecks, SigmaMaxAbove100IsRefused) {
  // The sigma ladder takes sigma_max <= 100 (core/schedule/sigma_schedule.cc, kMaxSigma; the
  // Schedule method refuses more as sigma.sigma_max).
  const Error e = ErrorOf(std::string(kMinimal) + "diffusion:\n  sigma_max: 1000\n");
  EXPECT_EQ(e.kind(), ErrorKind::kInvalidArgument);
  EXPECT_EQ(e.field(), "train.yaml:6: diffusion.sigma_max") << e.what();
  EXPECT_TRUE(Mentions(e, "must be <= 100")) << e.what();
  EXPECT_NO_THROW(
      ReadTrainConfig(std::string(kMinimal) + "diffusion:\n  sigma_max: 100\n", "", "train.yaml"));
}

// ---- threads: core/common/thread_count.h, the one reading of a thread count (ceiling 1024).

TEST(TrainConfigChecks, ThreadsFollowTheOneThreadCountReading) {
  Error e = ErrorOf(std::string(kMinimal) + "training:\n  threads: 2000\n");
  EXPECT_EQ(e.kind(), ErrorKind::kLimitExceeded) << e.what();
  EXPECT_EQ(e.field(), "train.yaml:6: training.threads") << e.what();
  e = ErrorOf(std::string(kMinimal) + "training:\n  threads: 1025\n");
  EXPECT_EQ(e.kind(), ErrorKind::kLimitExceeded) << e.what();
  e = ErrorOf(std::string(kMinimal) + "training:\n  threads: -1\n");
  EXPECT_EQ(e.kind(), ErrorKind::kInvalidArgument) << e.what();
  EXPECT_EQ(e.field(), "train.yaml:6: training.threads") << e.what();
  const TrainSettings s =
      ReadTrainConfig(std::string(kMinimal) + "training:\n  threads: 1024\n", "", "train.yaml");
  EXPECT_EQ(s.optimisation.threads, 1024);
}

// ---- the file as a whole (CONFIG.md: only data and output are required).

TEST(TrainConfigChecks, EmptyFileLacksTheRequiredSectionsAtLineOne) {
  for (const char* empty : {"", "# nothing yet\n", "~\n"}) {
    const Error e = ErrorOf(empty);
    EXPECT_EQ(e.field(), "train.yaml:1: data") << "'" << empty << "': " << e.what();
    EXPECT_TRUE(Mentions(e, "required section data is missing")) << e.what();
  }
}

TEST(TrainConfigChecks, ListOrSingleValueIsNotAConfiguration) {
  Error e = ErrorOf("- data\n- output\n");
  EXPECT_EQ(e.field(), "train.yaml:1") << e.what();
  EXPECT_EQ(std::string(e.what()),
            "train.yaml:1: the configuration must be a mapping of sections (data:, output:, ...), "
            "not a list");
  e = ErrorOf("\n\ntrain please\n");
  EXPECT_EQ(e.field(), "train.yaml:3") << e.what();
  EXPECT_TRUE(Mentions(e, "not a single value")) << e.what();
}

TEST(TrainConfigChecks, MisspeltKeyIsNamedBeforeTheKeyItLeavesMissing) {
  Error e = ErrorOf("data:\n  directroy: d\noutput: {model: m}\n");
  EXPECT_EQ(e.field(), "train.yaml:2: data.directroy") << e.what();
  EXPECT_TRUE(Mentions(e, "unknown key")) << e.what();
  e = ErrorOf("data: {directory: d}\noutput:\n  modle: m\n");
  EXPECT_EQ(e.field(), "train.yaml:3: output.modle") << e.what();
  e = ErrorOf("dta: {directory: d}\noutput: {model: m}\n");
  EXPECT_EQ(e.field(), "train.yaml:1: dta") << e.what();
}

// ---- errors of the data, named by the key that set them (CONFIG.md: file, line and key path).

TEST(TrainConfigChecks, DataErrorsNameTheConfigurationKey) {
  const TrainSettings s = ReadTrainConfig(
      "data:\n  directory: structures\n  properties: [band_gap, density]\noutput: {model: m}\n",
      "/runs/a", "train.yaml");
  Error e = AtConfigKey(Error(ErrorKind::kIo, "directory", "cannot list"), s);
  EXPECT_EQ(e.kind(), ErrorKind::kIo);
  EXPECT_EQ(e.field(), "train.yaml:2: data.directory");
  EXPECT_EQ(e.detail(), "cannot list");
  e = AtConfigKey(InvalidArgument("property_names[1]", "no value"), s);
  EXPECT_EQ(e.field(), "train.yaml:3: data.properties[1]");
  // A key the file leaves out is placed at its section's line.
  e = AtConfigKey(LimitExceeded("max_structures", "too many"), s);
  EXPECT_EQ(e.field(), "train.yaml:1: data.max_structures");
  // Errors about anything else keep their field.
  e = AtConfigKey(InvalidArgument("limits.max_atoms", "x"), s);
  EXPECT_EQ(e.field(), "limits.max_atoms");
  e = AtConfigKey(InvalidArgument("directory", "x"), TrainSettings{});
  EXPECT_EQ(e.field(), "directory");
}

TEST(TrainConfigChecks, MissingDataDirectoryIsReportedAtItsKey) {
  const TrainSettings s = ReadTrainConfig(
      "data:\n  directory: /nonexistent/nucleate-train-config-test\noutput: {model: m}\n", "",
      "train.yaml");
  try {
    Train(s);
    ADD_FAILURE() << "trained without data";
  } catch (const Error& e) {
    EXPECT_EQ(e.kind(), ErrorKind::kIo) << e.what();
    EXPECT_EQ(e.field(), "train.yaml:2: data.directory") << e.what();
    EXPECT_TRUE(Mentions(e, "/nonexistent/nucleate-train-config-test")) << e.what();
  }
}

TEST(TrainConfigChecks, MissingStructureSetIsReportedAtItsKey) {
  const TrainSettings s = ReadTrainConfig(
      "data: {structure_set: /nonexistent/nucleate-train-config-test.pb}\noutput: {model: m}\n",
      "", "train.yaml");
  try {
    Train(s);
    ADD_FAILURE() << "trained without data";
  } catch (const Error& e) {
    EXPECT_EQ(e.kind(), ErrorKind::kIo) << e.what();
    EXPECT_EQ(e.field(), "train.yaml:1: data.structure_set") << e.what();
  }
}

}  // namespace
}  // namespace nucleate::train
