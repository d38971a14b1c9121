#include "sample_table.h"

#include <string>

#include "json_reply.h"

namespace nucleate::cli {
namespace {

std::string Symbols(const YAML::Node& list) {
  std::string text;
  for (const YAML::Node& symbol : list)
    text += (text.empty() ? "" : ",") + symbol.as<std::string>();
  return text;
}

}  // namespace

// Toxic and radioactive elements: flags for handling, not failures.
std::string HandlingFlags(const YAML::Node& report) {
  std::string flags;
  const std::string toxic = Symbols(report["toxic_elements"]);
  const std::string radioactive = Symbols(report["radioactive_elements"]);
  if (!toxic.empty()) flags += "toxic:" + toxic;
  if (!radioactive.empty()) flags += (flags.empty() ? "" : " ") + ("radioactive:" + radioactive);
  return flags.empty() ? "-" : flags;
}

std::string SpaceGroupText(const YAML::Node& report) {
  const int number = report["space_group_number"].as<int>(0);
  if (number <= 0) return "none";
  return report["international_symbol"].as<std::string>("?") + " (" + std::to_string(number) + ")";
}

void PrintSampleTable(const SampleResult& result, std::FILE* out) {
  std::fprintf(out, "%s\n\n", result.caution.c_str());
  std::fprintf(out, "%6s  %-16s %5s  %-16s %9s  %12s  %-5s  %-12s  %s\n", "index", "formula",
               "atoms", "space group", "min dist", "density", "valid", "duplicate of", "flags");
  for (const CandidateRow& row : result.rows) {
    if (!row.error.empty()) {
      std::fprintf(out, "%6u  FAILED: %s\n", row.index, row.error.c_str());
      continue;
    }
    const YAML::Node& r = row.report;
    const std::string duplicate = row.duplicate_of >= 0 ? std::to_string(row.duplicate_of) : "-";
    std::fprintf(out, "%6u  %-16s %5d  %-16s %7.3f A  %6.3f g/cm3  %-5s  %-12s  %s\n", row.index,
                 r["formula"].as<std::string>("").c_str(), r["num_atoms"].as<int>(0),
                 SpaceGroupText(r).c_str(), r["min_distance"] ? AsDouble(r["min_distance"]) : 0.0,
                 r["density"] ? AsDouble(r["density"]) : 0.0,
                 r["valid"].as<bool>(false) ? "yes" : "no", duplicate.c_str(), HandlingFlags(r).c_str());
    for (const YAML::Node& problem : r["problems"]) {
      std::fprintf(out, "        problem: %s\n", problem["message"].as<std::string>("").c_str());
    }
  }
  std::fprintf(out, "\n%s\n", SampleCountsLine(result).c_str());
}

std::string SampleCountsLine(const SampleResult& result) {
  const auto n = [&](const char* field) { return std::to_string(SummaryCount(result, field)); };
  return n("requested") + " requested: " + n("finished") + " finished, " + n("failed") +
         " failed, " + n("valid") + " valid, " + n("unique") + " unique (" + n("valid_unique") +
         " valid and unique)";
}

}  // namespace nucleate::cli
