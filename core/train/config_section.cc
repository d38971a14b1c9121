#include "core/train/config_section.h"

#include <cstdlib>
#include <map>
#include <utility>

namespace nucleate::train {

ConfigSection::ConfigSection(const YAML::Node& node, std::string path, const std::string& source,
                             int line)
    : node_(node), path_(std::move(path)), source_(source), line_(line) {
  if (!node_ || node_.IsNull()) return;
  if (!node_.IsMap()) Fail(path_, node_, "must be a mapping");
  // yaml-cpp keeps both entries of a repeated key and finds the first; YAML 1.2 makes mapping keys
  // unique, so the second is refused rather than silently dropped.
  std::map<std::string, int> first_line;
  for (const auto& entry : node_) {
    if (!entry.first.IsScalar()) {
      Fail(path_, entry.first, "keys must be single names, not lists or mappings");
    }
    const std::string key = entry.first.Scalar();
    const auto [seen, inserted] = first_line.emplace(key, LineOf(entry.first));
    if (!inserted) {
      Fail(Join(key), entry.first,
           "is given twice (first on line " + std::to_string(seen->second) +
               "); a key appears once in a mapping");
    }
  }
}

bool ConfigSection::Has(const std::string& key) const {
  return node_ && node_.IsMap() && node_[key];
}

YAML::Node ConfigSection::At(const std::string& key) const {
  const YAML::Node& node = node_;  // const: a lookup must never add the key
  return node[key];
}

ConfigSection ConfigSection::Child(const std::string& key) {
  used_.insert(key);
  if (!Has(key)) return ConfigSection(YAML::Node(), Join(key), source_, line_);
  // The section's line is its key's: a block mapping's own mark is its first key, a line lower.
  int line = line_;
  for (const auto& entry : node_) {
    if (entry.first.Scalar() == key) {
      line = LineOf(entry.first);
      break;
    }
  }
  return ConfigSection(At(key), Join(key), source_, line);
}

void ConfigSection::ReadList(const std::string& key, std::vector<std::string>* out) {
  used_.insert(key);
  if (!Has(key)) return;
  const YAML::Node v = At(key);
  if (!v.IsSequence()) Fail(Join(key), v, "must be a list");
  out->clear();
  for (const auto& item : v) {
    if (!item.IsScalar()) Fail(Join(key), item, "entries must be single values");
    out->push_back(item.Scalar());
  }
}

void ConfigSection::Finish() const {
  if (!node_ || !node_.IsMap()) return;
  for (const auto& entry : node_) {
    const std::string key = entry.first.Scalar();
    if (!used_.count(key)) {
      std::string known;
      for (const auto& k : used_) known += (known.empty() ? "" : ", ") + k;
      Fail(Join(key), entry.first, "unknown key (known here: " + known + ")");
    }
  }
}

void ConfigSection::Check(const std::string& key, bool ok, const std::string& message) const {
  if (!ok) Fail(Join(key), LineOfKey(key), message);
}

std::string ConfigSection::Where(const std::string& key) const {
  return source_ + ":" + std::to_string(LineOfKey(key)) + ": " + Join(key);
}

void ConfigSection::Fail(const std::string& path, const YAML::Node& at, const std::string& message,
                         ErrorKind kind) const {
  Fail(path, LineOf(at), message, kind);
}

void ConfigSection::Fail(const std::string& path, int line, const std::string& message,
                         ErrorKind kind) const {
  const std::string where = source_ + ":" + std::to_string(line);
  throw Error(kind, path.empty() ? where : where + ": " + path, message);
}

void ConfigSection::FailAtField(const Error& error) const {
  // "properties[2]" is item 2 of the list under "properties": point at that item's line.
  // (No Node is reassigned here: yaml-cpp's assignment rewrites the node it referred to.)
  const std::string& field = error.field();
  const std::string key = field.substr(0, field.find_first_of("[."));
  const std::string path = field.empty() ? path_ : Join(field);
  if (!Has(key)) Fail(path, line_, error.detail(), error.kind());
  const YAML::Node value = At(key);
  if (value.IsSequence() && key.size() < field.size() && field[key.size()] == '[') {
    const std::size_t index = std::strtoul(field.c_str() + key.size() + 1, nullptr, 10);
    if (index < value.size()) Fail(path, value[index], error.detail(), error.kind());
  }
  Fail(path, value, error.detail(), error.kind());
}

int ConfigSection::LineOf(const YAML::Node& at) const {
  // A node yaml-cpp made up (an absent section, an empty file) has no mark.
  return at && at.Mark().line >= 0 ? at.Mark().line + 1 : line_;
}

int ConfigSection::LineOfKey(const std::string& key) const {
  return Has(key) ? LineOf(At(key)) : line_;
}

std::string ConfigSection::Join(const std::string& key) const {
  return path_.empty() ? key : path_ + "." + key;
}

}  // namespace nucleate::train
