#include "sample_outputs.h"

#include <CLI/CLI.hpp>
#include <filesystem>

#include "abi_client.h"
#include "atomic_file.h"
#include "html_report.h"
#include "json_reply.h"

namespace nucleate::cli {
namespace {

constexpr const char* kMultiCifName = "candidates.cif";
constexpr const char* kMultiSymmetrisedName = "candidates-symmetrised.cif";
constexpr const char* kXyzName = "candidates.xyz";
constexpr const char* kReportName = "report.html";
constexpr const char* kSummaryName = "summary.jsonl";

std::string CifName(std::uint32_t index) { return "sample-" + std::to_string(index) + ".cif"; }
std::string SymmetrisedCifName(std::uint32_t index) {
  return "sample-" + std::to_string(index) + "-symmetrised.cif";
}

std::string InFolder(const SampleOutputOptions& options, const std::string& name) {
  return (std::filesystem::path(options.out_dir) / name).string();
}

// Structures (JSON Structure messages) in one file format, written by the library.
std::string Converted(const std::vector<std::string>& structures, const char* format) {
  if (structures.empty()) return "";
  std::string inputs;
  for (const std::string& s : structures)
    inputs += (inputs.empty() ? "" : ",") + ("{\"structure\":" + s + "}");
  const YAML::Node reply = ParseJson(CallJson(
      "Convert", "{\"inputs\":[" + inputs + "],\"format\":\"" + std::string(format) + "\"}"));
  for (const YAML::Node& issue : reply["unreadable"]) {
    throw std::runtime_error("cannot write a candidate: " +
                             issue["error"]["message"].as<std::string>(""));
  }
  return reply["text"].as<std::string>("");
}

// The caution as CIF comment lines, so a file passed on alone still says what it is.
std::string CautionComment(const std::string& caution) {
  std::string out, line;
  std::size_t start = 0;
  while (start < caution.size()) {
    std::size_t end = caution.find(' ', start);
    if (end == std::string::npos) end = caution.size();
    const std::string word = caution.substr(start, end - start);
    if (!line.empty() && line.size() + 1 + word.size() > 96) {
      out += "# " + line + "\n";
      line.clear();
    }
    line += (line.empty() ? "" : " ") + word;
    start = end + 1;
  }
  if (!line.empty()) out += "# " + line + "\n";
  return out;
}

std::string JsonText(const YAML::Node& node) {
  return node ? JsonQuote(node.as<std::string>()) : "null";
}

std::string JsonSymbols(const YAML::Node& list) {
  std::string text;
  for (const YAML::Node& symbol : list)
    text += (text.empty() ? "" : ",") + JsonQuote(symbol.as<std::string>());
  return "[" + text + "]";
}

// One line of summary.jsonl. Failed samples have the same keys, with null where there is no value.
std::string SummaryLine(const CandidateRow& row, const std::string& caution) {
  const YAML::Node& r = row.report;
  const bool ok = row.error.empty();
  const auto number = [&](const char* field) {
    return !ok ? std::string("null") : r[field] ? JsonNumber(AsDouble(r[field])) : "0";
  };
  std::string problems;
  for (const YAML::Node& p : r["problems"]) {
    problems += (problems.empty() ? "" : ",") + ("{\"code\":" + JsonText(p["code"]) +
                                                 ",\"message\":" + JsonText(p["message"]) + "}");
  }
  std::string line = "{\"index\":" + std::to_string(row.index);
  line += ",\"formula\":" + (ok ? JsonText(r["formula"]) : "null");
  line += ",\"num_atoms\":" + number("num_atoms");
  line += ",\"valid\":" + std::string(ok && r["valid"].as<bool>(false) ? "true" : "false");
  line += ",\"problems\":[" + problems + "]";
  line += ",\"error\":" + (ok ? "null" : JsonQuote(row.error));
  line += ",\"space_group_number\":" + number("space_group_number");
  line += ",\"international_symbol\":" + (ok ? JsonText(r["international_symbol"]) : "null");
  line += ",\"min_distance\":" + number("min_distance");
  line += ",\"density\":" + number("density");
  line += ",\"group\":" + std::to_string(row.group);
  line += ",\"representative\":" + std::string(row.representative ? "true" : "false");
  line +=
      ",\"duplicate_of\":" + (row.duplicate_of >= 0 ? std::to_string(row.duplicate_of) : "null");
  line += ",\"toxic_elements\":" + JsonSymbols(r["toxic_elements"]);
  line += ",\"radioactive_elements\":" + JsonSymbols(r["radioactive_elements"]);
  line += ",\"file\":" + (row.file.empty() ? "null" : JsonQuote(row.file));
  line += ",\"symmetrised_file\":" +
          (row.symmetrised_file.empty() ? "null" : JsonQuote(row.symmetrised_file));
  line += ",\"caution\":" + JsonQuote(caution) + "}\n";
  return line;
}

}  // namespace

std::vector<std::string> PlannedOutputNames(const SamplePlan& plan) {
  std::vector<std::string> names;
  if (plan.output.multi_cif) {
    names.push_back(kMultiCifName);
    if (plan.output.symmetrise) names.push_back(kMultiSymmetrisedName);
  } else {
    for (std::uint64_t i = plan.first_index; i < std::uint64_t{plan.first_index} + plan.count;
         ++i) {
      names.push_back(CifName(static_cast<std::uint32_t>(i)));
      if (plan.output.symmetrise)
        names.push_back(SymmetrisedCifName(static_cast<std::uint32_t>(i)));
    }
  }
  names.push_back(kXyzName);
  names.push_back(kReportName);
  names.push_back(kSummaryName);
  return names;
}

bool PrepareOutputFolder(const SamplePlan& plan) {
  const std::filesystem::path folder(plan.output.out_dir);
  std::error_code error;
  if (std::filesystem::exists(folder, error) && !std::filesystem::is_directory(folder, error)) {
    throw CLI::ValidationError("--out", plan.output.out_dir + " exists and is not a folder");
  }
  const bool created = std::filesystem::create_directories(folder, error);
  if (error) {
    throw CLI::ValidationError("--out",
                               "cannot create " + plan.output.out_dir + ": " + error.message());
  }
  if (plan.output.force) return created;
  for (const std::string& name : PlannedOutputNames(plan)) {
    if (std::filesystem::exists(folder / name, error)) {
      throw CLI::ValidationError("--out", (folder / name).string() +
                                              " exists; pass --force to overwrite it, or choose "
                                              "another --out or --first-index");
    }
  }
  return created;
}

std::vector<std::string> WriteSampleOutputs(const SampleOutputOptions& options,
                                            SampleResult* result) {
  const std::string caution = CautionComment(result->caution);
  std::vector<std::string> written;
  const auto write = [&](const std::string& name, const std::string& text) {
    const std::string path = InFolder(options, name);
    WriteFileAtomically(path, text);
    written.push_back(path);
  };
  std::vector<std::string> structures, symmetrised;
  for (CandidateRow& row : result->rows) {
    if (!row.error.empty()) continue;
    structures.push_back(row.structure_json);
    if (!row.symmetrised_json.empty()) symmetrised.push_back(row.symmetrised_json);
    if (options.multi_cif) {
      row.file = kMultiCifName;
      if (!row.symmetrised_json.empty()) row.symmetrised_file = kMultiSymmetrisedName;
      continue;
    }
    row.file = CifName(row.index);
    write(row.file, caution + Converted({row.structure_json}, "STRUCTURE_FORMAT_CIF"));
    if (!row.symmetrised_json.empty()) {
      row.symmetrised_file = SymmetrisedCifName(row.index);
      write(row.symmetrised_file,
            caution + Converted({row.symmetrised_json}, "STRUCTURE_FORMAT_CIF_SYMMETRISED"));
    }
  }
  if (options.multi_cif && !structures.empty()) {
    write(kMultiCifName, caution + Converted(structures, "STRUCTURE_FORMAT_CIF"));
    if (!symmetrised.empty()) {
      write(kMultiSymmetrisedName,
            caution + Converted(symmetrised, "STRUCTURE_FORMAT_CIF_SYMMETRISED"));
    }
  }
  const std::string xyz = Converted(structures, "STRUCTURE_FORMAT_EXTXYZ");
  write(kXyzName, xyz);
  write(kReportName, SampleReportHtml(*result, xyz, "nucleate candidates"));
  std::string summary;
  for (const CandidateRow& row : result->rows) summary += SummaryLine(row, result->caution);
  write(kSummaryName, summary);
  return written;
}

}  // namespace nucleate::cli
