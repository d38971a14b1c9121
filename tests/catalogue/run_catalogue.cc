// Runs the catalogue of malformed inputs (*.yaml beside this file, README.md there): every entry
// is one input that must be refused with a specific status, naming the field or line at fault,
// with a message that says what was wrong. One test per entry, named <file>.<id>.
#include <algorithm>
#include <filesystem>
#include <fstream>
#include <iterator>
#include <ostream>
#include <map>
#include <set>
#include <sstream>
#include <string>
#include <vector>

#include <gtest/gtest.h>
#include <yaml-cpp/yaml.h>

#include <google/protobuf/struct.pb.h>
#include <google/protobuf/util/json_util.h>

#include "core/model/bundle/bundle_file.h"
#include "core/model/bundle/model_bundle.h"
#include "core/model/bundle/sealed_file.h"
#include "nucleate/nucleate.h"
#include "nucleate/v1/checks.pb.h"
#include "nucleate/v1/error.pb.h"
#include "nucleate/v1/model.pb.h"
#include "nucleate/v1/train.pb.h"
#include "tests/unit/capi/call_helpers.h"

namespace nucleate::test {
namespace {

namespace fs = std::filesystem;

struct Entry {
  std::string file;   // catalogue file stem ("cif")
  std::string id;
  YAML::Node node;
};

// The keys an entry may have; anything else is a typo the runner refuses.
const std::set<std::string> kKeys = {"id",      "input",  "why",     "method", "encoding",
                                     "request", "name",   "content", "report", "error_at",
                                     "yaml",    "model",  "status",  "field",  "line",
                                     "message"};

std::vector<Entry> LoadCatalogue() {
  std::vector<fs::path> files;
  for (const auto& e : fs::directory_iterator(NUCLEATE_CATALOGUE_DIR)) {
    if (e.path().extension() == ".yaml") files.push_back(e.path());
  }
  std::sort(files.begin(), files.end());
  std::vector<Entry> entries;
  for (const fs::path& path : files) {
    const YAML::Node root = YAML::LoadFile(path.string());
    for (const YAML::Node& node : root) {
      entries.push_back({path.stem().string(), node["id"].as<std::string>(""), node});
    }
  }
  return entries;
}

std::string Text(const YAML::Node& entry, const char* key) {
  return entry[key] ? entry[key].as<std::string>() : std::string();
}

std::string ReadBytes(const fs::path& path) {
  std::ifstream in(path, std::ios::binary);
  return {std::istreambuf_iterator<char>(in), std::istreambuf_iterator<char>()};
}

std::string FromHex(const std::string& hex) {
  std::string clean;
  for (char c : hex) {
    if (!std::isspace(static_cast<unsigned char>(c))) clean += c;
  }
  std::string bytes;
  for (std::size_t i = 0; i + 1 < clean.size(); i += 2) {
    bytes += static_cast<char>(std::stoi(clean.substr(i, 2), nullptr, 16));
  }
  return bytes;
}

// A folder of its own per entry under the test's working directory, emptied first.
fs::path ScratchFolder(const Entry& e) {
  const fs::path folder = fs::current_path() / "catalogue-scratch" / (e.file + "." + e.id);
  fs::remove_all(folder);
  fs::create_directories(folder);
  return folder;
}

// The committed tiny model, changed as `model` says: truncate (keep the first N bytes), flip
// (invert byte N), append (add the text), version (re-seal the payload under that format
// version), magic (re-seal under that magic), reseal_truncated (the first N bytes of the payload
// sealed with a right checksum), text (the whole file is that text).
std::string ModelVariant(const YAML::Node& spec) {
  const std::string tiny = ReadBytes(NUCLEATE_TINY_MODEL);
  if (spec["text"]) return spec["text"].as<std::string>();
  if (spec["truncate"]) return tiny.substr(0, spec["truncate"].as<std::size_t>());
  if (spec["flip"]) {
    std::string bytes = tiny;
    const std::size_t at = spec["flip"].as<std::size_t>();
    bytes.at(at) = static_cast<char>(~bytes.at(at));
    return bytes;
  }
  if (spec["append"]) return tiny + spec["append"].as<std::string>();
  const model::UnsealedFile unsealed =
      model::UnsealFile(tiny, model::kModelBundleMagic, model::kModelBundleFormatVersion,
                        tiny.size(), "tiny.nucleate");
  if (spec["version"]) {
    return model::SealFile(model::kModelBundleMagic, spec["version"].as<std::uint32_t>(),
                           unsealed.payload);
  }
  if (spec["reseal_truncated"]) {
    return model::SealFile(model::kModelBundleMagic, model::kModelBundleFormatVersion,
                           unsealed.payload.substr(0, spec["reseal_truncated"].as<std::size_t>()));
  }
  if (spec["magic"]) {
    return model::SealFile(spec["magic"].as<std::string>(), model::kModelBundleFormatVersion,
                           unsealed.payload);
  }
  ADD_FAILURE() << "model: give one of text, truncate, flip, append, version, magic, "
                   "reseal_truncated";
  return tiny;
}

// What came back, as the entry's expectations see it: the call's status and ErrorDetail, or for a
// structure file the file's report error (the call itself succeeds: other files go on).
struct Outcome {
  std::string status;
  v1::ErrorDetail detail;
};

Outcome FromCall(const CallResult& r, int32_t encoding) {
  Outcome out;
  out.status = nucleate_status_name(r.status);
  if (r.status == NUCLEATE_OK) return out;
  const bool parsed = encoding == NUCLEATE_ENCODING_JSON
                          ? google::protobuf::util::JsonStringToMessage(r.reply, &out.detail).ok()
                          : out.detail.ParseFromString(r.reply);
  EXPECT_TRUE(parsed) << "the failure reply is not an ErrorDetail: " << r.reply;
  EXPECT_EQ(out.detail.message(), r.message) << "reply and message disagree";
  return out;
}

// The ErrorDetail at `path` ("entries[1].error") of a successful JSON reply: methods that go on
// past a bad structure report it inside the reply.
Outcome FromReply(const std::string& reply_json, const std::string& path) {
  google::protobuf::Value node;
  Outcome out;
  if (!google::protobuf::util::JsonStringToMessage(reply_json, node.mutable_struct_value()).ok()) {
    ADD_FAILURE() << "the reply is not a JSON object: " << reply_json;
    return out;
  }
  std::stringstream steps(path);
  std::string step;
  while (std::getline(steps, step, '.')) {
    const std::size_t bracket = step.find('[');
    const std::string key = step.substr(0, bracket);
    if (!node.has_struct_value() || !node.struct_value().fields().count(key)) {
      ADD_FAILURE() << "the reply has no '" << key << "' on the way to " << path << ": " << reply_json;
      return out;
    }
    google::protobuf::Value next = node.struct_value().fields().at(key);
    if (bracket != std::string::npos) {
      const int i = std::stoi(step.substr(bracket + 1));
      if (!next.has_list_value() || i >= next.list_value().values_size()) {
        ADD_FAILURE() << "the reply has no " << step << " on the way to " << path;
        return out;
      }
      next = google::protobuf::Value(next.list_value().values(i));
    }
    node = next;
  }
  std::string detail_json;
  google::protobuf::util::MessageToJsonString(node, &detail_json);
  EXPECT_TRUE(google::protobuf::util::JsonStringToMessage(detail_json, &out.detail).ok())
      << path << " is not an ErrorDetail: " << detail_json;
  out.status = out.detail.status().empty() ? "NUCLEATE_OK" : out.detail.status();
  return out;
}

Outcome RunEntry(const Entry& e) {
  const YAML::Node& n = e.node;
  const std::string input = Text(n, "input");
  if (input == "request") {
    const bool binary = Text(n, "encoding") == "binary";
    const int32_t encoding = binary ? NUCLEATE_ENCODING_BINARY : NUCLEATE_ENCODING_JSON;
    const std::string request = binary ? FromHex(Text(n, "request")) : Text(n, "request");
    const CallResult r = Call(Text(n, "method"), request, encoding);
    if (n["error_at"] && r.status == NUCLEATE_OK && !binary) {
      return FromReply(r.reply, Text(n, "error_at"));
    }
    EXPECT_FALSE(n["error_at"] && binary) << "error_at needs a JSON request";
    return FromCall(r, encoding);
  }
  if (input == "structure_file") {
    v1::CheckRequest request;
    v1::StructureFile* file = request.add_inputs()->mutable_file();
    file->set_name(Text(n, "name"));
    file->set_content(Text(n, "content"));
    const CallResult r = Call("Check", request.SerializeAsString(), NUCLEATE_ENCODING_BINARY);
    Outcome out = FromCall(r, NUCLEATE_ENCODING_BINARY);
    if (r.status != NUCLEATE_OK) return out;
    v1::CheckReply reply;
    EXPECT_TRUE(reply.ParseFromString(r.reply));
    const int report = n["report"] ? n["report"].as<int>() : 0;
    if (report >= reply.reports_size()) {
      ADD_FAILURE() << "the reply has " << reply.reports_size() << " reports, no report " << report;
      return out;
    }
    const v1::ErrorDetail& error = reply.reports(report).error();
    out.status = error.status().empty() ? "NUCLEATE_OK" : error.status();
    out.detail = error;
    return out;
  }
  if (input == "train_config") {
    const fs::path folder = ScratchFolder(e);
    v1::TrainRequest request;
    request.set_config_yaml(Text(n, "yaml"));
    request.set_config_directory(folder.string());
    request.set_config_name("catalogue.yaml");
    const Outcome out =
        FromCall(Call("Train", request.SerializeAsString(), NUCLEATE_ENCODING_BINARY),
                 NUCLEATE_ENCODING_BINARY);
    // A refused configuration writes nothing.
    EXPECT_TRUE(fs::is_empty(folder)) << "Train wrote into " << folder;
    return out;
  }
  if (input == "model_file") {
    const fs::path path = ScratchFolder(e) / "model.nucleate";
    std::ofstream(path, std::ios::binary) << ModelVariant(n["model"]);
    v1::ModelInfoRequest request;
    request.set_path(path.string());
    return FromCall(Call("ModelInfo", request.SerializeAsString(), NUCLEATE_ENCODING_BINARY),
                    NUCLEATE_ENCODING_BINARY);
  }
  ADD_FAILURE() << "input must be request, structure_file, train_config or model_file, not '"
                << input << "'";
  return {};
}

// Failure output names the entry, not its bytes.
void PrintTo(const Entry& e, std::ostream* out) { *out << e.file << ".yaml: " << e.id; }

class Catalogue : public testing::TestWithParam<Entry> {};

TEST_P(Catalogue, IsRefusedAsExpected) {
  const Entry& e = GetParam();
  for (const auto& key : e.node) {
    EXPECT_TRUE(kKeys.count(key.first.as<std::string>())) << "unknown key " << key.first;
  }
  ASSERT_TRUE(e.node["status"] && e.node["message"]) << "every entry needs status and message";
  const Outcome out = RunEntry(e);
  EXPECT_EQ(out.status, Text(e.node, "status")) << out.detail.message();
  const std::string& message = out.detail.message();
  EXPECT_NE(message.find(Text(e.node, "message")), std::string::npos)
      << "message: " << message;
  EXPECT_EQ(message.find('\n'), std::string::npos) << "a message is one line";
  if (e.node["field"]) EXPECT_EQ(out.detail.field(), Text(e.node, "field")) << message;
  if (e.node["line"]) EXPECT_EQ(out.detail.line(), e.node["line"].as<int>()) << message;
}

std::string EntryName(const testing::TestParamInfo<Entry>& info) {
  return info.param.file + "_" + info.param.id;
}

INSTANTIATE_TEST_SUITE_P(All, Catalogue, testing::ValuesIn(LoadCatalogue()), EntryName);

// The catalogue itself: ids unique and usable as test names, and at least the promised size.
TEST(CatalogueFiles, HoldAtLeast200EntriesWithUniqueIds) {
  const std::vector<Entry> entries = LoadCatalogue();
  std::set<std::string> seen;
  for (const Entry& e : entries) {
    EXPECT_FALSE(e.id.empty()) << "an entry of " << e.file << ".yaml has no id";
    EXPECT_TRUE(std::all_of(e.id.begin(), e.id.end(),
                            [](char c) { return std::isalnum(static_cast<unsigned char>(c)) || c == '_'; }))
        << e.id;
    EXPECT_TRUE(seen.insert(e.file + "_" + e.id).second) << "duplicate id " << e.id;
  }
  EXPECT_GE(entries.size(), 200u);
  RecordProperty("entries", static_cast<int>(entries.size()));
}

}  // namespace
}  // namespace nucleate::test
