#include "core/train/data/properties_csv.h"

#include <optional>
#include <set>

#include "core/common/error.h"

namespace nucleate::train::data {
namespace {

std::string Trim(std::string_view text) {
  const auto blank = [](char c) { return c == ' ' || c == '\t'; };
  std::size_t begin = 0;
  std::size_t end = text.size();
  while (begin < end && blank(text[begin])) ++begin;
  while (end > begin && blank(text[end - 1])) --end;
  return std::string(text.substr(begin, end - begin));
}

// The fields of one line, or nullopt with `problem` set.
std::optional<std::vector<std::string>> SplitCsvLine(std::string_view line, std::string& problem) {
  std::vector<std::string> fields;
  std::size_t pos = 0;
  while (true) {
    std::size_t start = pos;
    while (start < line.size() && (line[start] == ' ' || line[start] == '\t')) ++start;
    if (start < line.size() && line[start] == '"') {
      std::string field;
      std::size_t i = start + 1;
      bool closed = false;
      while (i < line.size()) {
        if (line[i] == '"') {
          if (i + 1 < line.size() && line[i + 1] == '"') {
            field += '"';
            i += 2;
            continue;
          }
          closed = true;
          ++i;
          break;
        }
        field += line[i++];
      }
      if (!closed) {
        problem = "unterminated quoted field (fields may not span lines)";
        return std::nullopt;
      }
      while (i < line.size() && (line[i] == ' ' || line[i] == '\t')) ++i;
      if (i < line.size() && line[i] != ',') {
        problem = "text after a closing quote";
        return std::nullopt;
      }
      fields.push_back(Trim(field));
      if (i >= line.size()) break;
      pos = i + 1;
    } else {
      const std::size_t comma = line.find(',', pos);
      const std::size_t end = comma == std::string_view::npos ? line.size() : comma;
      const std::string field = Trim(line.substr(pos, end - pos));
      if (field.find('"') != std::string::npos) {
        problem = "a quote inside an unquoted field";
        return std::nullopt;
      }
      fields.push_back(field);
      if (comma == std::string_view::npos) break;
      pos = comma + 1;
    }
  }
  return fields;
}

}  // namespace

PropertyTable ParsePropertiesCsv(std::string_view text, const std::string& file_name,
                                 DatasetReport& report) {
  if (text.substr(0, 3) == "\xEF\xBB\xBF") text.remove_prefix(3);
  PropertyTable table;
  bool have_header = false;
  int line_number = 0;
  std::size_t pos = 0;
  while (pos < text.size()) {
    const std::size_t newline = text.find('\n', pos);
    const std::size_t end = newline == std::string_view::npos ? text.size() : newline;
    std::string_view line = text.substr(pos, end - pos);
    pos = end + 1;
    ++line_number;
    if (!line.empty() && line.back() == '\r') line.remove_suffix(1);
    if (Trim(line).empty()) continue;
    const std::string where = file_name + ":" + std::to_string(line_number);
    std::string problem;
    std::optional<std::vector<std::string>> fields = SplitCsvLine(line, problem);
    if (!have_header) {
      if (!fields) throw InvalidArgument(file_name, "header line " + std::to_string(line_number) +
                                                        ": " + problem);
      if ((*fields)[0] != "file") {
        throw InvalidArgument(file_name, "the header must start with the column 'file', found '" +
                                             (*fields)[0] + "'");
      }
      std::set<std::string> seen;
      for (std::size_t k = 1; k < fields->size(); ++k) {
        const std::string& name = (*fields)[k];
        if (name.empty()) {
          throw InvalidArgument(file_name, "header column " + std::to_string(k + 1) + " is empty");
        }
        if (!seen.insert(name).second) {
          throw InvalidArgument(file_name, "header names the column '" + name + "' twice");
        }
        table.columns.push_back(name);
      }
      have_header = true;
      continue;
    }
    if (!fields) {
      report.AddProblem(where, problem + "; row ignored");
      ++report.property_rows_rejected;
      continue;
    }
    if (fields->size() != table.columns.size() + 1) {
      report.AddProblem(where, "has " + std::to_string(fields->size()) + " fields, the header " +
                                   std::to_string(table.columns.size() + 1) + "; row ignored");
      ++report.property_rows_rejected;
      continue;
    }
    if ((*fields)[0].empty()) {
      report.AddProblem(where, "names no structure (empty first field); row ignored");
      ++report.property_rows_rejected;
      continue;
    }
    PropertyRow row;
    row.key = (*fields)[0];
    row.line = line_number;
    row.values.assign(fields->begin() + 1, fields->end());
    table.rows.push_back(std::move(row));
  }
  if (!have_header) throw InvalidArgument(file_name, "no header line 'file,<property>,...'");
  return table;
}

}  // namespace nucleate::train::data
