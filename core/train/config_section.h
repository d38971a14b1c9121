// One mapping of a YAML configuration, read key by key. Every refusal names the file, the line and
// the key path ("train.yaml:12: training.batch_size: must be >= 1"), in the error's field as
// "<file>:<line>: <key path>". Keys are unique (YAML 1.2) and a key nobody reads is refused, so a
// typo or a repeated key never trains a model with a setting silently dropped.
#pragma once

#include <cmath>
#include <set>
#include <string>
#include <type_traits>
#include <vector>

#include <yaml-cpp/yaml.h>

#include "core/common/error.h"

namespace nucleate::train {

class ConfigSection {
 public:
  // `node` may be absent or null (a section the file leaves out: every key keeps its default);
  // anything else but a mapping is refused, as is a key given twice or a key that is not a name.
  // `line` is where the section is named (1 for the file itself): errors about a key the section
  // lacks point there.
  ConfigSection(const YAML::Node& node, std::string path, const std::string& source, int line = 1);

  bool Has(const std::string& key) const;
  // The nested mapping under `key` (marked read).
  ConfigSection Child(const std::string& key);

  // Reads a single value into `value` when the key is present (marked read either way).
  template <typename V>
  void Read(const std::string& key, V* value) {
    used_.insert(key);
    if (!Has(key)) return;
    const YAML::Node v = At(key);
    if (!v.IsScalar()) Fail(Join(key), v, "must be a single value");
    try {
      *value = v.as<V>();
    } catch (const YAML::Exception&) {
      Fail(Join(key), v, "cannot read '" + v.Scalar() + "' as " + TypeName<V>());
    }
    if constexpr (std::is_floating_point_v<V>) {
      if (!std::isfinite(*value)) Fail(Join(key), v, "must be finite");
    }
  }
  void ReadList(const std::string& key, std::vector<std::string>* out);

  // Refuses every key nobody read. Call it after the reads and before the range checks, so a
  // misspelt key is named as unknown rather than reported as the missing key it was meant to be.
  void Finish() const;

  // A range check, reported at the key's line (the section's when the key is absent).
  void Check(const std::string& key, bool ok, const std::string& message) const;

  // Runs `check`, a core validator that names its fields as this section names its keys
  // ("hidden", "properties[2]", "steps"), and reports what it refuses against that key, at its
  // line, keeping the error's kind (a size above a limit stays LimitExceeded).
  template <typename F>
  void Validate(F&& check) const {
    try {
      check();
    } catch (const Error& error) {
      FailAtField(error);
    }
  }

  // "<file>:<line>: <key path>" of `key`, at the section's line when the key is absent: the label
  // for errors about this setting found later (when the data are read).
  std::string Where(const std::string& key) const;

  // Throws `kind` with field "<file>:<line>: <path>" ("<file>:<line>" for an empty path), the
  // line being that of `at`, or `line`.
  [[noreturn]] void Fail(const std::string& path, const YAML::Node& at, const std::string& message,
                         ErrorKind kind = ErrorKind::kInvalidArgument) const;
  [[noreturn]] void Fail(const std::string& path, int line, const std::string& message,
                         ErrorKind kind = ErrorKind::kInvalidArgument) const;

 private:
  YAML::Node At(const std::string& key) const;
  int LineOf(const YAML::Node& at) const;
  int LineOfKey(const std::string& key) const;  // of its value; the section's when absent
  std::string Join(const std::string& key) const;
  [[noreturn]] void FailAtField(const Error& error) const;
  template <typename V>
  static std::string TypeName() {
    if constexpr (std::is_same_v<V, bool>) return "true or false";
    if constexpr (std::is_integral_v<V>) return "an integer";
    if constexpr (std::is_floating_point_v<V>) return "a number";
    return "text";
  }

  YAML::Node node_;
  std::string path_;
  const std::string& source_;
  int line_;  // where the section is named
  std::set<std::string> used_;
};

}  // namespace nucleate::train
