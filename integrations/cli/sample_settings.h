// The settings of `nucleate sample`, from flags and from a YAML job file alike: one table of
// keys (the flag is --key with '-' for '_'), values kept as text with where they came from, so
// every error names the flag, or the job file's line and key, that was wrong.
#pragma once

#include <map>
#include <string>
#include <vector>

namespace nucleate::cli {

enum class SettingKind {
  kValue,       // one value
  kList,        // comma-separated on the command line; a list or such a text in a job file
  kSwitch,      // a flag without a value; true / false in a job file
  kProperties,  // --property name=value, repeatable; a mapping name: value in a job file
};

struct SettingSpec {
  const char* key;  // snake_case: the job file's key
  SettingKind kind;
  const char* task;        // the task key this setting belongs to; nullptr for every task
  bool is_path;            // a file or folder: in a job file, relative to the file's folder
  const char* value_name;  // for --help: FILE, N, ... (nullptr for a switch)
  const char* help;
};

// Every setting, in the order `nucleate sample --help` lists them. The task keys are
// "composition", "de_novo", "vary" and "constrain".
const std::vector<SettingSpec>& SampleSettingSpecs();
const SettingSpec* FindSampleSetting(const std::string& key);

// "--fix-atoms" for "fix_atoms".
std::string FlagName(const std::string& key);

struct Setting {
  std::string text;    // lists comma-joined; switches "true" or "false"
  std::string origin;  // "--seed", or "job.yaml:4: seed"
};

struct SampleSettings {
  std::map<std::string, Setting> values;      // by key
  std::map<std::string, Setting> properties;  // by property name: the value's text
  // The task key whose value is set (a switch only when true); empty when none. Throws
  // CLI::ValidationError naming both origins when two tasks are set.
  std::string Task() const;
};

// The job file's settings overridden by the command line's. A task named on the command line
// replaces the file's task together with the file's settings of other tasks (--de-novo over a
// file's composition drops its formula_units); a property is overridden by name.
SampleSettings MergeSettings(const SampleSettings& job_file, const SampleSettings& command_line);

}  // namespace nucleate::cli
