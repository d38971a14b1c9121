#include "check_command.h"

#include <cstdio>
#include <iostream>
#include <memory>

#include "abi_client.h"
#include "json_reply.h"
#include "structure_files.h"

namespace nucleate::cli {
namespace {

// Exit codes beyond main's: some structure was invalid or could not be read.
constexpr int kExitSomeInvalid = 3;

struct CheckOptions {
  std::vector<std::string> files;
  bool json = false;
  double symprec = 0.1;
  double min_distance = 0.5;
  CLI::Option* symprec_option = nullptr;
  CLI::Option* min_distance_option = nullptr;
};

std::string Text(const YAML::Node& node) { return node ? node.as<std::string>() : ""; }

void PrintReport(const YAML::Node& r) {
  if (r["error"] && !Text(r["error"]["message"]).empty()) {
    std::printf("%-32s  UNREADABLE  %s\n", Text(r["source"]).c_str(),
                Text(r["error"]["message"]).c_str());
    return;
  }
  const int sg = std::stoi(Text(r["space_group_number"]));
  std::printf("%-32s  %-14s %4s atoms  SG %-10s  dmin %6.3f A  %7.3f g/cm3  %s\n",
              Text(r["source"]).c_str(), Text(r["formula"]).c_str(),
              Text(r["num_atoms"]).c_str(),
              sg > 0 ? (Text(r["international_symbol"]) + " (" + std::to_string(sg) + ")").c_str()
                     : "none",
              AsDouble(r["min_distance"]), AsDouble(r["density"]),
              r["valid"].as<bool>() ? "valid" : "INVALID");
  for (const YAML::Node& problem : r["problems"]) {
    std::printf("    problem: %s\n", Text(problem["message"]).c_str());
  }
  for (const char* flag : {"toxic_elements", "radioactive_elements"}) {
    std::string symbols;
    for (const YAML::Node& symbol : r[flag]) symbols += (symbols.empty() ? "" : " ") + Text(symbol);
    if (!symbols.empty()) {
      std::printf("    flag: %s %s (follow your local safety rules)\n",
                  std::string(flag).substr(0, std::string(flag).find('_')).c_str(),
                  symbols.c_str());
    }
  }
  for (const YAML::Node& warning : r["warnings"]) {
    std::printf("    note: %s\n", Text(warning).c_str());
  }
}

int RunCheck(const CheckOptions& options) {
  int unreadable_files = 0;
  std::string request = "{\"inputs\":" + FileInputsJson(options.files, &unreadable_files);
  if (options.symprec_option->count() > 0) request += ",\"symprec\":" + JsonNumber(options.symprec);
  if (options.min_distance_option->count() > 0) {
    request += ",\"thresholds\":{\"min_distance\":" + JsonNumber(options.min_distance) + "}";
  }
  request += "}";
  const std::string reply_json = CallJson("Check", request);

  const YAML::Node reply = ParseJson(reply_json);
  if (options.json) {
    for (const std::string& report : JsonArrayElements(reply_json, "reports")) {
      std::cout << report << '\n';
    }
  } else {
    for (const YAML::Node& report : reply["reports"]) PrintReport(report);
  }
  const YAML::Node summary = reply["summary"];
  const int invalid = summary["invalid"].as<int>();
  const int unreadable = summary["unreadable"].as<int>() + unreadable_files;
  // With --json, stdout holds only the JSON lines; the summary goes to stderr.
  std::FILE* out = options.json ? stderr : stdout;
  std::fprintf(out, "\n%d structures: %d valid, %d invalid, %d unreadable\n",
               summary["structures"].as<int>(), summary["valid"].as<int>(), invalid, unreadable);
  return invalid + unreadable > 0 ? kExitSomeInvalid : 0;
}

}  // namespace

void AddCheckCommand(CLI::App& app, std::function<int()>* run) {
  auto options = std::make_shared<CheckOptions>();
  CLI::App* command = app.add_subcommand(
      "check",
      "Check structures in CIF, extended XYZ (.xyz, .extxyz) or protobuf JSON (.json) files. "
      "Exit 0 when all are valid, 3 when any is invalid or unreadable");
  command->add_option("files", options->files, "Structure files")->required();
  command->add_flag("--json", options->json,
                    "One JSON object per structure on stdout (proto field names)");
  options->symprec_option =
      command->add_option("--symprec", options->symprec, "Symmetry tolerance in angstrom (0.1)");
  options->min_distance_option = command->add_option(
      "--min-distance", options->min_distance, "Smallest allowed interatomic distance, A (0.5)");
  command->callback([options, run] { *run = [options] { return RunCheck(*options); }; });
}

}  // namespace nucleate::cli
