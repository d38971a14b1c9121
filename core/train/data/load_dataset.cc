#include "core/train/data/load_dataset.h"

#include <algorithm>
#include <cmath>
#include <filesystem>
#include <limits>
#include <map>
#include <optional>
#include <set>
#include <system_error>
#include <utility>

#include "core/common/error.h"
#include "core/common/message_text.h"
#include "core/structure/io/structure_file.h"
#include "core/structure/io/text_file.h"
#include "core/structure/io/text_number.h"
#include "core/train/data/prepare_example.h"
#include "core/train/data/properties_csv.h"
#include "core/train/data/structure_message.h"
#include "nucleate/v1/dataset.pb.h"

namespace nucleate::train::data {
namespace {

namespace fs = std::filesystem;

// Every structure found, usable or not: a CSV row naming a skipped structure is not a row
// naming a missing one.
struct FoundStructure {
  std::string source;
  std::string file;  // the structure file it came from; empty for a StructureSet
  std::int64_t example = -1;  // index into Dataset::examples, -1 when skipped
};

constexpr std::int64_t kStructureSetProgressEvery = 1000;
constexpr std::size_t kProblemsQuotedInError = 5;

bool IsStructureFileName(const std::string& name) {
  using structure::io::HasExtension;
  return HasExtension(name, ".cif") || HasExtension(name, ".xyz") ||
         HasExtension(name, ".extxyz");
}

void CheckSource(const DataSource& source) {
  if (source.directory.empty() == source.structure_set_file.empty()) {
    throw InvalidArgument("directory", "set exactly one of directory and structure_set_file");
  }
  if (!std::isfinite(source.symprec) || !(source.symprec > 0.0)) {
    throw InvalidArgument("symprec", "must be a finite number > 0 (angstrom)");
  }
  if (source.limits.max_atoms < 1 ||
      source.limits.max_atoms > structure::StructureLimits::kCeilingMaxAtoms) {
    throw InvalidArgument("limits.max_atoms",
                          "must lie in 1.." +
                              std::to_string(structure::StructureLimits::kCeilingMaxAtoms));
  }
  if (!std::isfinite(source.limits.max_cell_length) || !(source.limits.max_cell_length > 0.0)) {
    throw InvalidArgument("limits.max_cell_length", "must be a finite number > 0 (angstrom)");
  }
  if (source.max_structures < 1) throw InvalidArgument("max_structures", "must be at least 1");
  if (source.max_file_bytes < 1) throw InvalidArgument("max_file_bytes", "must be at least 1");
  if (source.max_structure_set_bytes < 1 ||
      source.max_structure_set_bytes > std::numeric_limits<int>::max()) {
    throw InvalidArgument("max_structure_set_bytes",
                          "must lie in 1..2147483647 (protobuf's message size limit)");
  }
  std::set<std::string> seen;
  for (std::size_t k = 0; k < source.property_names.size(); ++k) {
    const std::string field = "property_names[" + std::to_string(k) + "]";
    if (source.property_names[k].empty()) throw InvalidArgument(field, "is empty");
    if (!seen.insert(source.property_names[k]).second) {
      throw InvalidArgument(field, "'" + source.property_names[k] + "' is named twice");
    }
  }
}

class Loader {
 public:
  Loader(const DataSource& source, const LoadProgressCallback& progress)
      : source_(source), progress_(progress) {}

  Dataset Run() {
    CheckSource(source_);
    if (!source_.directory.empty()) {
      LoadDirectory();
    } else {
      LoadStructureSet();
    }
    if (dataset_.examples.empty()) ThrowNothingUsable();
    if (!source_.properties_csv.empty()) ApplyPropertiesCsv();
    CheckEveryPropertyHasValues();
    dataset_.report.structures_kept = static_cast<std::int64_t>(dataset_.examples.size());
    return std::move(dataset_);
  }

 private:
  void ReportProgress() {
    if (progress_ && !progress_(progress_state_)) {
      throw Error(ErrorKind::kCancelled, "progress", "the caller stopped loading the data set");
    }
  }

  void LoadDirectory() {
    std::error_code ec;
    fs::directory_iterator it(source_.directory, ec);
    if (ec) {
      throw Error(ErrorKind::kIo, "directory",
                  "cannot list '" + source_.directory + "': " + ec.message());
    }
    std::vector<std::string> names;
    for (; it != fs::directory_iterator(); it.increment(ec)) {
      if (ec) break;
      std::error_code type_ec;
      const std::string name = it->path().filename().string();
      if (!IsStructureFileName(name)) {
        ++dataset_.report.files_ignored;
      } else if (it->is_regular_file(type_ec)) {
        names.push_back(name);
      } else {
        // A structure file's name on a folder or a dangling link: the user meant it as data.
        ++dataset_.report.files_skipped;
        dataset_.report.AddProblem(name, "is not a regular file (a folder or a broken link)");
      }
    }
    if (ec) {
      throw Error(ErrorKind::kIo, "directory",
                  "cannot list '" + source_.directory + "': " + ec.message());
    }
    std::sort(names.begin(), names.end());
    progress_state_.files_total = static_cast<std::int64_t>(names.size());
    for (const std::string& name : names) {
      LoadStructureFile(name);
      ++progress_state_.files_done;
      ReportProgress();
    }
  }

  void LoadStructureFile(const std::string& name) {
    DatasetReport& report = dataset_.report;
    const std::string path = (fs::path(source_.directory) / name).string();
    std::string content;
    try {
      content = structure::io::ReadTextFile(path, source_.max_file_bytes);
    } catch (const Error& error) {
      ++report.files_skipped;
      report.AddProblem(name, error.detail());
      return;
    }
    std::vector<structure::io::FileStructure> entries = structure::io::ReadStructureFile(
        name, content, structure::io::FileFormat::kFromName, source_.limits);
    // ReadStructureFile names a whole-file failure by the file name alone, a structure's by
    // "<file>#<block>" or "<file>@<frame>".
    if (entries.size() == 1 && entries[0].error && entries[0].source == name) {
      ++report.files_skipped;
      report.AddProblem(name, entries[0].error->what());
      return;
    }
    ++report.files_read;
    if (entries.empty()) {
      report.AddProblem(name, "holds no structure");
      return;
    }
    for (structure::io::FileStructure& entry : entries) {
      for (std::string& warning : entry.warnings) report.AddWarning(std::move(warning));
      AddStructure(std::move(entry.source), name, std::move(entry.crystal),
                   std::move(entry.error));
    }
  }

  void LoadStructureSet() {
    const std::string& path = source_.structure_set_file;
    std::string bytes;
    try {
      bytes = structure::io::ReadTextFile(path, source_.max_structure_set_bytes);
    } catch (const Error& error) {
      throw Error(error.kind(), "structure_set_file", "'" + path + "': " + error.detail());
    }
    v1::StructureSet set;
    if (!ParseQuietly(bytes, &set)) {
      throw InvalidArgument("structure_set_file",
                            "'" + path + "' is not a binary nucleate.v1.StructureSet");
    }
    bytes.clear();
    bytes.shrink_to_fit();
    ++dataset_.report.files_read;
    progress_state_.files_total = 1;
    for (int i = 0; i < set.structures_size(); ++i) {
      const v1::Structure& message = set.structures(i);
      const std::string field = "structures[" + std::to_string(i) + "]";
      std::string label = message.label().empty() ? field : message.label();
      std::optional<structure::Crystal> crystal;
      std::optional<Error> error;
      try {
        crystal = CrystalFromMessage(message, source_.limits);
      } catch (const Error& e) {
        error = e.WithinField(field);
      }
      AddStructure(std::move(label), "", std::move(crystal), std::move(error));
      if ((i + 1) % kStructureSetProgressEvery == 0) ReportProgress();
    }
    progress_state_.files_done = 1;
    ReportProgress();
  }

  void AddStructure(std::string source, std::string file, std::optional<structure::Crystal> crystal,
                    std::optional<Error> error) {
    if (static_cast<std::int64_t>(found_.size()) >= source_.max_structures) {
      throw LimitExceeded("max_structures", "more than " + std::to_string(source_.max_structures) +
                                                " structures in the data set");
    }
    DatasetReport& report = dataset_.report;
    FoundStructure found{source, std::move(file), -1};
    if (!error && crystal) {
      try {
        bool no_space_group = false;
        TrainingExample example = PrepareExample(std::move(*crystal), source, source_.symprec,
                                                 source_.limits, source_.property_names,
                                                 no_space_group);
        if (no_space_group) {
          report.AddWarning(source + ": no space group found at symprec " +
                            structure::io::FormatShortest(source_.symprec) +
                            " A; crystal system and space group left 0");
        }
        RejectNonFiniteOwnProperties(example);
        found.example = static_cast<std::int64_t>(dataset_.examples.size());
        dataset_.examples.push_back(std::move(example));
        ++progress_state_.structures_kept;
      } catch (const Error& e) {
        error = e;
      }
    }
    if (found.example < 0) {
      ++report.structures_skipped;
      report.AddProblem(source, error ? error->what() : "no structure");
    }
    found_.push_back(std::move(found));
  }

  void RejectNonFiniteOwnProperties(const TrainingExample& example) {
    for (const std::string& name : source_.property_names) {
      const auto it = example.crystal.properties.find(name);
      if (it != example.crystal.properties.end() && !std::isfinite(it->second)) {
        ++dataset_.report.property_values_rejected;
        dataset_.report.AddProblem(example.source, "property '" + name +
                                                       "' is not a finite number; left missing");
      }
    }
  }

  [[noreturn]] void ThrowNothingUsable() const {
    const DatasetReport& report = dataset_.report;
    const std::string field = source_.directory.empty() ? "structure_set_file" : "directory";
    const std::string& where =
        source_.directory.empty() ? source_.structure_set_file : source_.directory;
    std::string message = "'" + where + "' holds no usable structure (" +
                          std::to_string(report.files_read) + " files read, " +
                          std::to_string(report.files_skipped) + " unreadable, " +
                          std::to_string(report.structures_skipped) + " structures skipped)";
    for (std::size_t k = 0; k < report.problems.size() && k < kProblemsQuotedInError; ++k) {
      message += "; " + report.problems[k].source + ": " + report.problems[k].reason;
    }
    throw InvalidArgument(field, message);
  }

  // Structure keys of the CSV: every source, and every file name. A file holding several
  // structures thus names them all, which ApplyPropertiesCsv refuses as ambiguous.
  std::map<std::string, std::vector<std::size_t>> CsvKeys() const {
    std::map<std::string, std::vector<std::size_t>> keys;
    for (std::size_t i = 0; i < found_.size(); ++i) {
      keys[found_[i].source].push_back(i);
      const std::string& file = found_[i].file;
      if (!file.empty() && file != found_[i].source) keys[file].push_back(i);
    }
    return keys;
  }

  void ApplyPropertiesCsv() {
    DatasetReport& report = dataset_.report;
    const std::string& path = source_.properties_csv;
    const std::string name = fs::path(path).filename().string();
    std::string text;
    try {
      text = structure::io::ReadTextFile(path, source_.max_file_bytes);
    } catch (const Error& error) {
      throw Error(error.kind(), "properties_csv", "'" + path + "': " + error.detail());
    }
    PropertyTable table;
    try {
      table = ParsePropertiesCsv(text, name, report);
    } catch (const Error& error) {
      throw InvalidArgument("properties_csv", error.what());
    }
    std::vector<int> column(source_.property_names.size(), -1);
    for (std::size_t k = 0; k < source_.property_names.size(); ++k) {
      const auto it = std::find(table.columns.begin(), table.columns.end(),
                                source_.property_names[k]);
      if (it != table.columns.end()) column[k] = static_cast<int>(it - table.columns.begin());
    }
    const std::map<std::string, std::vector<std::size_t>> keys = CsvKeys();
    std::map<std::size_t, int> row_line_of_structure;
    for (const PropertyRow& row : table.rows) {
      const std::string where = name + ":" + std::to_string(row.line);
      const auto it = keys.find(row.key);
      if (it == keys.end()) {
        ++report.property_rows_rejected;
        report.AddProblem(where, "names '" + row.key + "', which is no file or structure of the "
                                 "data set; row ignored");
        continue;
      }
      if (it->second.size() > 1) {
        ++report.property_rows_rejected;
        report.AddProblem(where, "'" + row.key + "' names " + std::to_string(it->second.size()) +
                                     " structures; name one by its source (" +
                                     found_[it->second[0]].source + ", ...); row ignored");
        continue;
      }
      const std::size_t index = it->second[0];
      const auto [previous, inserted] = row_line_of_structure.emplace(index, row.line);
      if (!inserted) {
        ++report.property_rows_rejected;
        report.AddProblem(where, "a second row for " + found_[index].source +
                                     " (the first is line " + std::to_string(previous->second) +
                                     "); row ignored");
        continue;
      }
      if (found_[index].example < 0) continue;  // the structure's own problem is reported
      TrainingExample& example = dataset_.examples[static_cast<std::size_t>(found_[index].example)];
      for (std::size_t k = 0; k < column.size(); ++k) {
        if (column[k] < 0) continue;
        const std::string& text_value = row.values[static_cast<std::size_t>(column[k])];
        if (text_value.empty()) continue;
        const std::optional<double> value = structure::io::ParseDecimal(text_value);
        if (!value || !std::isfinite(*value)) {
          ++report.property_values_rejected;
          example.properties[k] = std::numeric_limits<double>::quiet_NaN();
          report.AddProblem(where, "property '" + source_.property_names[k] + "' of " +
                                       example.source + ": '" + text_value +
                                       "' is not a number; left missing");
          continue;
        }
        example.properties[k] = *value;
      }
    }
  }

  void CheckEveryPropertyHasValues() const {
    for (std::size_t k = 0; k < source_.property_names.size(); ++k) {
      const bool any = std::any_of(
          dataset_.examples.begin(), dataset_.examples.end(),
          [k](const TrainingExample& e) { return std::isfinite(e.properties[k]); });
      if (!any) {
        throw InvalidArgument("property_names[" + std::to_string(k) + "]",
                              "no usable structure has a value for '" +
                                  source_.property_names[k] + "' (neither in properties_csv nor "
                                  "in the structures' own properties)");
      }
    }
  }

  const DataSource& source_;
  const LoadProgressCallback& progress_;
  Dataset dataset_;
  std::vector<FoundStructure> found_;
  LoadProgress progress_state_;
};

}  // namespace

Dataset LoadDataset(const DataSource& source, const LoadProgressCallback& progress) {
  return Loader(source, progress).Run();
}

}  // namespace nucleate::train::data
