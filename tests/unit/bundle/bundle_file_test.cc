#include "core/model/bundle/bundle_file.h"

#include <gtest/gtest.h>

#include <cmath>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <limits>
#include <string>

#include "bundle_fixture.h"
#include "core/common/error.h"
#include "core/model/bundle/bundle_messages.h"
#include "core/model/bundle/sealed_file.h"
#include "nucleate/v1/model.pb.h"

namespace nucleate::model {
namespace {

using testing::ErrorFrom;
using testing::SmallBundle;
using testing::TemporaryDirectory;

bool Contains(const std::string& text, const std::string& part) {
  return text.find(part) != std::string::npos;
}

// Seals a bundle message as SaveModelBundle would, after `change` edits it: files that the
// library refuses to write but a damaged or foreign writer could produce.
std::string FileWithEditedMessage(const std::function<void(v1::ModelBundle&)>& change,
                                  std::uint32_t container_version = kModelBundleFormatVersion) {
  v1::ModelBundle message;
  ToMessage(SmallBundle(), &message);
  change(message);
  return SealFile(kModelBundleMagic, container_version, message.SerializeAsString());
}

void ExpectRefused(const std::string& bytes, ErrorKind kind, const std::string& words,
                   const LayoutForArchitecture& layout = {}, const BundleLimits& limits = {}) {
  const Error error = ErrorFrom([&] { DecodeModelBundle(bytes, "m.nucleate", limits, layout); });
  EXPECT_EQ(error.kind(), kind) << error.what();
  EXPECT_EQ(error.field(), "m.nucleate");
  EXPECT_TRUE(Contains(error.detail(), words)) << "expected '" << words << "' in: " << error.what();
}

void ExpectSameBundle(const ModelBundle& a, const ModelBundle& b) {
  const Architecture& x = a.architecture;
  const Architecture& y = b.architecture;
  EXPECT_EQ(x.hidden, y.hidden);
  EXPECT_EQ(x.layers, y.layers);
  EXPECT_EQ(x.fourier_frequencies, y.fourier_frequencies);
  EXPECT_EQ(x.radial_basis, y.radial_basis);
  EXPECT_EQ(x.radial_max, y.radial_max);
  EXPECT_EQ(x.time_embedding, y.time_embedding);
  EXPECT_EQ(x.cutoff_from_atoms, y.cutoff_from_atoms);
  EXPECT_EQ(x.cutoff, y.cutoff);
  EXPECT_EQ(x.species_mode, y.species_mode);
  EXPECT_EQ(x.elements, y.elements);
  EXPECT_EQ(x.condition_composition, y.condition_composition);
  EXPECT_EQ(x.condition_crystal_system, y.condition_crystal_system);
  EXPECT_EQ(x.condition_space_group, y.condition_space_group);
  EXPECT_EQ(x.properties, y.properties);

  const auto& ls = a.schedules.lattice;
  const auto& lt = b.schedules.lattice;
  EXPECT_EQ(ls.kind, lt.kind);
  EXPECT_EQ(ls.steps, lt.steps);
  EXPECT_EQ(ls.beta_start, lt.beta_start);
  EXPECT_EQ(ls.beta_end, lt.beta_end);
  EXPECT_EQ(ls.cosine_offset, lt.cosine_offset);
  EXPECT_EQ(ls.max_beta, lt.max_beta);
  EXPECT_EQ(ls.sigmoid_start, lt.sigmoid_start);
  EXPECT_EQ(ls.sigmoid_end, lt.sigmoid_end);
  EXPECT_EQ(ls.sigmoid_tau, lt.sigmoid_tau);
  EXPECT_EQ(ls.log_snr_max, lt.log_snr_max);
  EXPECT_EQ(ls.log_snr_min, lt.log_snr_min);
  EXPECT_EQ(ls.log_snr_shift, lt.log_snr_shift);
  EXPECT_EQ(ls.zero_terminal_snr, lt.zero_terminal_snr);
  EXPECT_EQ(ls.respaced_steps, lt.respaced_steps);
  const auto& cs = a.schedules.coordinates;
  const auto& ct = b.schedules.coordinates;
  EXPECT_EQ(cs.kind, ct.kind);
  EXPECT_EQ(cs.steps, ct.steps);
  EXPECT_EQ(cs.sigma_min, ct.sigma_min);
  EXPECT_EQ(cs.sigma_max, ct.sigma_max);
  EXPECT_EQ(cs.rho, ct.rho);
  const auto& ss = a.schedules.species;
  const auto& st = b.schedules.species;
  EXPECT_EQ(ss.kind, st.kind);
  EXPECT_EQ(ss.retention, st.retention);
  EXPECT_EQ(ss.steps, st.steps);
  EXPECT_EQ(ss.num_classes, st.num_classes);
  EXPECT_EQ(ss.cosine_offset, st.cosine_offset);

  EXPECT_EQ(a.normalisation.lattice_mean, b.normalisation.lattice_mean);
  EXPECT_EQ(a.normalisation.lattice_std, b.normalisation.lattice_std);
  EXPECT_EQ(a.normalisation.property_mean, b.normalisation.property_mean);
  EXPECT_EQ(a.normalisation.property_std, b.normalisation.property_std);
  EXPECT_EQ(a.atom_counts.overall, b.atom_counts.overall);
  EXPECT_EQ(a.atom_counts.by_crystal_system, b.atom_counts.by_crystal_system);

  ASSERT_EQ(a.layout.tensors().size(), b.layout.tensors().size());
  for (std::size_t k = 0; k < a.layout.tensors().size(); ++k) {
    EXPECT_EQ(a.layout.tensor(k).name, b.layout.tensor(k).name);
    EXPECT_EQ(a.layout.tensor(k).rows, b.layout.tensor(k).rows);
    EXPECT_EQ(a.layout.tensor(k).cols, b.layout.tensor(k).cols);
    EXPECT_EQ(a.layout.tensor(k).offset, b.layout.tensor(k).offset);
  }
  ASSERT_EQ(a.values.size(), b.values.size());
  // Bit for bit: -0 and 0 compare equal as floats, so compare the bytes.
  EXPECT_EQ(std::memcmp(a.values.data(), b.values.data(), a.values.size() * sizeof(float)), 0);

  EXPECT_EQ(a.provenance.dataset_hash, b.provenance.dataset_hash);
  EXPECT_EQ(a.provenance.seed, b.provenance.seed);
  EXPECT_EQ(a.provenance.settings, b.provenance.settings);
  EXPECT_EQ(a.provenance.library_version, b.provenance.library_version);
  EXPECT_EQ(a.provenance.training_steps, b.provenance.training_steps);
  EXPECT_EQ(a.provenance.train_count, b.provenance.train_count);
  EXPECT_EQ(a.provenance.validation_count, b.provenance.validation_count);
  EXPECT_EQ(a.provenance.test_count, b.provenance.test_count);
}

// ---- round trip ---------------------------------------------------------------------------------

TEST(BundleFile, SaveThenLoadGivesTheSameBundleBitForBit) {
  TemporaryDirectory directory;
  const std::string path = directory.File("small.nucleate");
  const ModelBundle saved = SmallBundle();
  SaveModelBundle(path, saved);
  const ModelBundle loaded = LoadModelBundle(path);
  ExpectSameBundle(saved, loaded);
  EXPECT_EQ(std::signbit(loaded.values[0]), true);  // -0 stayed negative
}

TEST(BundleFile, LoadingWithTheMatchingLayoutKeepsThatLayout) {
  const ModelBundle saved = SmallBundle();
  const std::string bytes = EncodeModelBundle(saved);
  const ModelBundle loaded =
      DecodeModelBundle(bytes, "m", {}, [&](const Architecture&) { return saved.layout; });
  ExpectSameBundle(saved, loaded);
  // The expected layout's initialisation is kept, not the placeholder of a rebuilt layout.
  EXPECT_EQ(loaded.layout.tensor(0).init, nn::TensorSpec::Init::kNormal);
  EXPECT_EQ(loaded.layout.tensor(0).init_scale, 0.1);
}

TEST(BundleFile, GivenSpeciesModeStoresNoSpeciesSchedule) {
  ModelBundle saved = SmallBundle();
  saved.architecture.species_mode = SpeciesMode::kGiven;
  saved.schedules.species.steps = 7;  // not used in this mode: neither saved nor loaded
  v1::ModelBundle message;
  ToMessage(saved, &message);
  EXPECT_FALSE(message.schedules().has_species());
  const ModelBundle loaded = DecodeModelBundle(EncodeModelBundle(saved), "m");
  EXPECT_EQ(loaded.architecture.species_mode, SpeciesMode::kGiven);
  EXPECT_EQ(loaded.schedules.species.steps, schedule::TransitionParams{}.steps);
  saved.schedules.species = schedule::TransitionParams{};
  ExpectSameBundle(saved, loaded);
}

TEST(BundleFile, EncodingIsDeterministic) {
  EXPECT_EQ(EncodeModelBundle(SmallBundle()), EncodeModelBundle(SmallBundle()));
}

// ---- atomic save --------------------------------------------------------------------------------

TEST(BundleFile, SaveLeavesOnlyTheFinalFileAndReplacesAnOldOne) {
  TemporaryDirectory directory;
  const std::string path = directory.File("model.nucleate");
  { std::ofstream(path) << "an older, different file"; }
  SaveModelBundle(path, SmallBundle());
  std::vector<std::string> names;
  for (const auto& entry : std::filesystem::directory_iterator(directory.path())) {
    names.push_back(entry.path().filename().string());
  }
  EXPECT_EQ(names, std::vector<std::string>{"model.nucleate"});
  EXPECT_NO_THROW(LoadModelBundle(path));
}

TEST(BundleFile, AnUnwritableDestinationIsAnIoErrorAndLeavesNoTemporaryFile) {
  TemporaryDirectory directory;
  const std::string path = directory.File("missing_folder/model.nucleate");
  const Error error = ErrorFrom([&] { SaveModelBundle(path, SmallBundle()); });
  EXPECT_EQ(error.kind(), ErrorKind::kIo);
  EXPECT_TRUE(std::filesystem::is_empty(directory.path()));
}

TEST(BundleFile, AFailedRenameRemovesTheTemporaryFile) {
  TemporaryDirectory directory;
  // rename() cannot replace a non-empty directory with a file.
  const std::string path = directory.File("occupied");
  std::filesystem::create_directories(path + "/inside");
  const Error error = ErrorFrom([&] { SaveModelBundle(path, SmallBundle()); });
  EXPECT_EQ(error.kind(), ErrorKind::kIo);
  EXPECT_EQ(error.field(), path);
  EXPECT_FALSE(std::filesystem::exists(path + ".tmp"));
}

TEST(BundleFile, SaveRefusesABundleItCouldNotLoad) {
  ModelBundle bundle = SmallBundle();
  bundle.values[5] = std::numeric_limits<float>::quiet_NaN();
  TemporaryDirectory directory;
  const std::string path = directory.File("model.nucleate");
  const Error error = ErrorFrom([&] { SaveModelBundle(path, bundle); });
  EXPECT_EQ(error.kind(), ErrorKind::kInvalidArgument);
  EXPECT_EQ(error.field(), "tensors[0]");
  EXPECT_TRUE(std::filesystem::is_empty(directory.path()));
}

// ---- refusals: the file as a whole --------------------------------------------------------------

TEST(BundleFile, AMissingFileIsAnIoErrorNamingThePath) {
  TemporaryDirectory directory;
  const std::string path = directory.File("absent.nucleate");
  const Error error = ErrorFrom([&] { LoadModelBundle(path); });
  EXPECT_EQ(error.kind(), ErrorKind::kIo);
  EXPECT_EQ(error.field(), path);
}

TEST(BundleFile, AFileAboveTheDefaultLimitIsRefusedBeforeReading) {
  TemporaryDirectory directory;
  const std::string path = directory.File("huge.nucleate");
  // A sparse file: 600 MiB of size, no data blocks. Reading it would take seconds and 600 MiB.
  { std::ofstream(path) << ""; }
  std::filesystem::resize_file(path, std::uint64_t{600} << 20);
  const Error error = ErrorFrom([&] { LoadModelBundle(path); });
  EXPECT_EQ(error.kind(), ErrorKind::kLimitExceeded);
  EXPECT_EQ(error.field(), path);
  EXPECT_TRUE(Contains(error.detail(), "629145600 bytes")) << error.what();
  EXPECT_TRUE(Contains(error.detail(), "limit of 536870912 bytes")) << error.what();
}

TEST(BundleFile, ACallersSmallerFileLimitIsHonoured) {
  TemporaryDirectory directory;
  const std::string path = directory.File("model.nucleate");
  SaveModelBundle(path, SmallBundle());
  BundleLimits limits;
  limits.max_file_bytes = std::filesystem::file_size(path) - 1;
  EXPECT_EQ(ErrorFrom([&] { LoadModelBundle(path, limits); }).kind(), ErrorKind::kLimitExceeded);
  limits.max_file_bytes += 1;
  EXPECT_NO_THROW(LoadModelBundle(path, limits));
}

TEST(BundleFile, LimitsAboveTheCeilingAreRefused) {
  BundleLimits limits;
  limits.max_file_bytes = BundleLimits::kCeilingMaxFileBytes + 1;
  const Error error = ErrorFrom([&] { DecodeModelBundle("", "m", limits); });
  EXPECT_EQ(error.field(), "limits.max_file_bytes");
}

TEST(BundleFile, EveryTruncatedFileIsRefusedAsTruncated) {
  const std::string bytes = EncodeModelBundle(SmallBundle());
  ASSERT_GT(bytes.size(), 500u);
  for (std::size_t length = 0; length < bytes.size(); ++length) {
    const Error error =
        ErrorFrom([&] { DecodeModelBundle(bytes.substr(0, length), "m.nucleate"); });
    ASSERT_EQ(error.kind(), ErrorKind::kInvalidArgument) << length << ": " << error.what();
    ASSERT_EQ(error.field(), "m.nucleate");
    ASSERT_TRUE(Contains(error.detail(), "truncated")) << length << ": " << error.what();
  }
}

TEST(BundleFile, AFlippedPayloadByteIsRefusedAsCorrupted) {
  const std::string bytes = EncodeModelBundle(SmallBundle());
  // The payload sits between the short header (magic, version, tag, length) and the 34-byte
  // digest field; flip bytes spread over it, the first and last included.
  const std::size_t first = 24, last = bytes.size() - 35;
  for (std::size_t at = first; at <= last; at += (last - first) / 40) {
    for (std::size_t i : {at, last}) {
      std::string damaged = bytes;
      damaged[i] = static_cast<char>(damaged[i] ^ 0x20);
      ExpectRefused(damaged, ErrorKind::kInvalidArgument, "corrupted");
    }
  }
}

TEST(BundleFile, ACheckpointIsNotAModel) {
  v1::ModelBundle message;
  ToMessage(SmallBundle(), &message);
  const std::string bytes = SealFile("nucleate-checkpoint", 1, message.SerializeAsString());
  ExpectRefused(bytes, ErrorKind::kInvalidArgument, "is not a 'nucleate-model' file");
}

TEST(BundleFile, ANewerFormatVersionNamesBothVersions) {
  const std::string bytes = FileWithEditedMessage(
      [](v1::ModelBundle& m) { m.set_format_version(kModelBundleFormatVersion + 1); },
      kModelBundleFormatVersion + 1);
  ExpectRefused(bytes, ErrorKind::kUnsupported, "has format version 2");
  ExpectRefused(bytes, ErrorKind::kUnsupported, "reads 'nucleate-model' files up to version 1");
}

TEST(BundleFile, ABundleVersionDisagreeingWithItsContainerIsDamaged) {
  const std::string bytes =
      FileWithEditedMessage([](v1::ModelBundle& m) { m.set_format_version(0); });
  ExpectRefused(bytes, ErrorKind::kInvalidArgument, "damaged");
}

TEST(BundleFile, AChecksummedPayloadThatIsNoBundleIsRefused) {
  // Field 2 (architecture) declared 100 bytes long with 1 byte present.
  const std::string bytes = SealFile(kModelBundleMagic, 1, std::string("\x12\x64\x00", 3));
  ExpectRefused(bytes, ErrorKind::kInvalidArgument, "cannot be parsed");
}

// ---- refusals: the tensors ----------------------------------------------------------------------

TEST(BundleFile, AShapeDisagreeingWithTheArchitectureIsRefused) {
  const ModelBundle saved = SmallBundle();
  const std::string bytes = EncodeModelBundle(saved);
  const auto wider = [&](const Architecture&) {
    nn::ParameterLayout layout;
    for (const nn::TensorSpec& s : saved.layout.tensors()) {
      layout.Add(s.name, s.rows, s.name == "layer0.edge_in.bias" ? s.cols + 1 : s.cols, s.init,
                 s.init_scale);
    }
    return layout;
  };
  ExpectRefused(bytes, ErrorKind::kInvalidArgument,
                "tensors[2]: 'layer0.edge_in.bias' has shape 1x8; "
                "the architecture expects shape 1x9",
                wider);
}

TEST(BundleFile, AMissingOrRenamedTensorIsRefused) {
  const ModelBundle saved = SmallBundle();
  const std::string bytes = EncodeModelBundle(saved);
  const auto one_more = [&](const Architecture&) {
    nn::ParameterLayout layout = saved.layout;
    layout.Add("head.weight", 8, 3, nn::TensorSpec::Init::kNormal, 0.1);
    return layout;
  };
  ExpectRefused(bytes, ErrorKind::kInvalidArgument, "holds 3 tensors; the architecture expects 4",
                one_more);
  const auto renamed = [&](const Architecture&) {
    nn::ParameterLayout layout;
    for (const nn::TensorSpec& s : saved.layout.tensors()) {
      layout.Add(s.name == "species_embedding" ? "atom_embedding" : s.name, s.rows, s.cols, s.init,
                 s.init_scale);
    }
    return layout;
  };
  ExpectRefused(bytes, ErrorKind::kInvalidArgument, "the architecture expects 'atom_embedding'",
                renamed);
}

TEST(BundleFile, AShapeDisagreeingWithItsValuesIsRefused) {
  ExpectRefused(
      FileWithEditedMessage([](v1::ModelBundle& m) { m.mutable_tensors(1)->set_rows(9); }),
      ErrorKind::kInvalidArgument,
      "tensors[1]: 'layer0.edge_in.weight' has shape 9x8 but 128 values");
  ExpectRefused(
      FileWithEditedMessage([](v1::ModelBundle& m) { m.mutable_tensors(0)->set_cols(0); }),
      ErrorKind::kInvalidArgument, "rows and cols must be >= 1");
  ExpectRefused(FileWithEditedMessage([](v1::ModelBundle& m) {
                  m.mutable_tensors(2)->set_name("species_embedding");
                }),
                ErrorKind::kInvalidArgument, "repeats the tensor name");
}

TEST(BundleFile, MoreTensorValuesThanTheLimitAreRefused) {
  const std::string bytes = EncodeModelBundle(SmallBundle());
  BundleLimits limits;
  limits.max_tensor_values = SmallBundle().values.size() - 1;
  ExpectRefused(bytes, ErrorKind::kLimitExceeded, "values in all", {}, limits);
  limits.max_tensor_values += 1;
  EXPECT_NO_THROW(DecodeModelBundle(bytes, "m", limits));
}

TEST(BundleFile, NonFiniteTensorValuesAreRefused) {
  const float nan = std::numeric_limits<float>::quiet_NaN();
  const float inf = std::numeric_limits<float>::infinity();
  ExpectRefused(
      FileWithEditedMessage([&](v1::ModelBundle& m) { m.mutable_tensors(1)->set_values(17, nan); }),
      ErrorKind::kInvalidArgument,
      "tensors[1]: 'layer0.edge_in.weight' value 17 (row 2, column 1) is not finite (NaN)");
  ExpectRefused(
      FileWithEditedMessage([&](v1::ModelBundle& m) { m.mutable_tensors(2)->set_values(0, -inf); }),
      ErrorKind::kInvalidArgument, "is not finite (infinite)");
}

// ---- refusals: the rest of the bundle -----------------------------------------------------------

TEST(BundleFile, AnInvalidArchitectureIsRefusedNamingTheField) {
  ExpectRefused(
      FileWithEditedMessage([](v1::ModelBundle& m) { m.mutable_architecture()->set_hidden(0); }),
      ErrorKind::kInvalidArgument, "architecture.hidden: is 0, must be in 1..1024");
  ExpectRefused(FileWithEditedMessage(
                    [](v1::ModelBundle& m) { m.mutable_architecture()->set_elements(1, 2); }),
                ErrorKind::kInvalidArgument, "architecture.elements[1]");
  ExpectRefused(FileWithEditedMessage([](v1::ModelBundle& m) {
                  m.mutable_architecture()->set_species_mode(static_cast<v1::SpeciesMode>(9));
                }),
                ErrorKind::kInvalidArgument, "architecture.species_mode: unknown species mode 9");
}

TEST(BundleFile, InconsistentSchedulesAreRefused) {
  ExpectRefused(FileWithEditedMessage([](v1::ModelBundle& m) {
                  m.mutable_schedules()->mutable_coordinates()->set_steps(400);
                }),
                ErrorKind::kInvalidArgument, "schedules.coordinates.steps");
  ExpectRefused(FileWithEditedMessage([](v1::ModelBundle& m) {
                  m.mutable_schedules()->mutable_species()->set_num_classes(3);
                }),
                ErrorKind::kInvalidArgument, "schedules.species.num_classes: is 3");
  ExpectRefused(FileWithEditedMessage([](v1::ModelBundle& m) {
                  m.mutable_schedules()->mutable_lattice()->set_beta_start(-1);
                }),
                ErrorKind::kInvalidArgument, "schedules.lattice.beta_start");
  ExpectRefused(
      FileWithEditedMessage([](v1::ModelBundle& m) { m.mutable_schedules()->clear_lattice(); }),
      ErrorKind::kInvalidArgument, "schedules.lattice: is missing");
  ExpectRefused(
      FileWithEditedMessage([](v1::ModelBundle& m) { m.mutable_schedules()->clear_species(); }),
      ErrorKind::kInvalidArgument, "schedules.species: is missing");
}

TEST(BundleFile, BadStatisticsHistogramsAndHashAreRefused) {
  ExpectRefused(FileWithEditedMessage(
                    [](v1::ModelBundle& m) { m.mutable_normalisation()->set_lattice_std(3, 0.0); }),
                ErrorKind::kInvalidArgument,
                "normalisation.lattice_std[3]: must be a finite number > 0");
  ExpectRefused(FileWithEditedMessage(
                    [](v1::ModelBundle& m) { m.mutable_normalisation()->add_lattice_mean(1.0); }),
                ErrorKind::kInvalidArgument, "the lattice has 6 numbers");
  ExpectRefused(FileWithEditedMessage(
                    [](v1::ModelBundle& m) { m.mutable_normalisation()->clear_property_std(); }),
                ErrorKind::kInvalidArgument, "for 1 properties");
  ExpectRefused(FileWithEditedMessage([](v1::ModelBundle& m) {
                  m.mutable_atom_counts()->mutable_by_crystal_system()->RemoveLast();
                }),
                ErrorKind::kInvalidArgument, "one per crystal system (7)");
  BundleLimits limits;
  limits.max_histogram_atoms = 3;  // the fixture's overall histogram reaches 4 atoms
  ExpectRefused(EncodeModelBundle(SmallBundle()), ErrorKind::kLimitExceeded,
                "atom_counts.overall.counts", {}, limits);
  ExpectRefused(FileWithEditedMessage([](v1::ModelBundle& m) {
                  m.mutable_provenance()->set_dataset_hash("not a digest");
                }),
                ErrorKind::kInvalidArgument, "provenance.dataset_hash");
}

}  // namespace
}  // namespace nucleate::model
