#include "sample_job_file.h"

#include <yaml-cpp/yaml.h>

#include <CLI/CLI.hpp>
#include <filesystem>
#include <fstream>
#include <sstream>

namespace nucleate::cli {
namespace {

std::string Where(const std::string& path, const YAML::Node& node) {
  const int line = node.Mark().line >= 0 ? node.Mark().line + 1 : 0;
  return path + ":" + std::to_string(line);
}

std::string KnownKeys() {
  std::string known;
  for (const SettingSpec& spec : SampleSettingSpecs()) {
    known += (known.empty() ? "" : ", ") + std::string(spec.key);
  }
  return known;
}

std::string ResolvePath(const std::string& value, const std::filesystem::path& folder) {
  const std::filesystem::path path(value);
  if (path.is_absolute() || folder.empty()) return value;
  return (folder / path).lexically_normal().string();
}

// A value's text: a scalar as written; for lists, a sequence of scalars joined by commas.
std::string ValueText(const SettingSpec& spec, const YAML::Node& value, const std::string& origin) {
  if (value.IsScalar()) return value.Scalar();
  if (spec.kind == SettingKind::kList && value.IsSequence()) {
    std::string text;
    for (const YAML::Node& item : value) {
      if (!item.IsScalar())
        throw CLI::ValidationError(origin, "list entries must be single values");
      text += (text.empty() ? "" : ",") + item.Scalar();
    }
    return text;
  }
  if (value.IsNull()) throw CLI::ValidationError(origin, "has no value");
  throw CLI::ValidationError(origin, spec.kind == SettingKind::kList
                                         ? "must be a list or a single value"
                                         : "must be a single value");
}

}  // namespace

SampleSettings ReadSampleJobFile(const std::string& path) {
  std::ifstream file(path, std::ios::binary);
  if (!file) throw std::runtime_error("cannot read the job file '" + path + "'");
  std::ostringstream text;
  text << file.rdbuf();
  YAML::Node root;
  try {
    root = YAML::Load(text.str());
  } catch (const YAML::Exception& e) {
    throw CLI::ValidationError(path + ":" + std::to_string(e.mark.line + 1), e.msg);
  }
  if (root.IsNull()) return {};
  if (!root.IsMap()) {
    throw CLI::ValidationError(Where(path, root), "a job file is a mapping of key: value lines");
  }
  const std::filesystem::path folder = std::filesystem::path(path).parent_path();
  SampleSettings settings;
  for (const auto& entry : root) {
    const std::string key = entry.first.Scalar();
    const std::string origin = Where(path, entry.first) + ": " + key;
    const SettingSpec* spec = FindSampleSetting(key);
    if (spec == nullptr) {
      throw CLI::ValidationError(origin, "unknown key (known keys: " + KnownKeys() + ")");
    }
    if (settings.values.count(key) > 0 || (key == "property" && !settings.properties.empty())) {
      throw CLI::ValidationError(origin, "appears twice");
    }
    const YAML::Node value = entry.second;
    if (spec->kind == SettingKind::kProperties) {
      if (!value.IsMap()) throw CLI::ValidationError(origin, "must be a mapping of name: value");
      for (const auto& property : value) {
        const std::string name = property.first.Scalar();
        const std::string property_origin = Where(path, property.first) + ": " + key + "." + name;
        if (!property.second.IsScalar()) {
          throw CLI::ValidationError(property_origin, "must be a single number");
        }
        settings.properties[name] = {property.second.Scalar(), property_origin};
      }
      continue;
    }
    std::string value_text = ValueText(*spec, value, origin);
    if (spec->is_path) value_text = ResolvePath(value_text, folder);
    settings.values[key] = {value_text, origin};
  }
  return settings;
}

}  // namespace nucleate::cli
