#include "match_command.h"

#include <cstdio>
#include <iostream>
#include <memory>

#include "abi_client.h"
#include "json_reply.h"
#include "structure_files.h"

namespace nucleate::cli {
namespace {

// Exit code of match when the structures differ, and of dedup when some file was unreadable.
constexpr int kExitNoMatch = 3;

// Tolerance flags shared by match and dedup: only those given go into the request.
struct ToleranceFlags {
  double length = 0.2, site = 0.3, angle = 5.0;
  bool supercell = false;
  CLI::Option *length_option = nullptr, *site_option = nullptr, *angle_option = nullptr;

  void Add(CLI::App* command) {
    length_option = command->add_option("--length-tolerance", length,
                                         "Fractional cell-length tolerance (0.2)");
    site_option = command->add_option("--site-tolerance", site,
                                      "Site tolerance in units of (V/N)^(1/3) (0.3)");
    angle_option = command->add_option("--angle-tolerance", angle, "Degrees (5)");
    command->add_flag("--supercell", supercell, "Let a structure match a supercell of the other");
  }

  std::string Json() const {
    std::string fields;
    auto add = [&fields](const std::string& field) {
      fields += (fields.empty() ? "" : ",") + field;
    };
    if (length_option->count()) add("\"length_tolerance\":" + JsonNumber(length));
    if (site_option->count()) add("\"site_tolerance\":" + JsonNumber(site));
    if (angle_option->count()) add("\"angle_tolerance\":" + JsonNumber(angle));
    if (supercell) add("\"allow_supercell\":true");
    return "{" + fields + "}";
  }
};

struct MatchOptions {
  std::string a, b;
  bool json = false;
  ToleranceFlags tolerances;
};

int RunMatch(const MatchOptions& options) {
  const std::string reply_json =
      CallJson("Match", "{\"a\":" + FileInputJson(options.a) + ",\"b\":" +
                            FileInputJson(options.b) + ",\"tolerances\":" +
                            options.tolerances.Json() + "}");
  const YAML::Node reply = ParseJson(reply_json);
  const bool match = reply["match"].as<bool>();
  if (options.json) {
    std::cout << reply_json << '\n';
  } else if (match) {
    std::printf("match: the same crystal (rms %.4g, max %.4g in units of (V/N)^(1/3))\n",
                AsDouble(reply["rms"]), AsDouble(reply["max_displacement"]));
  } else {
    std::printf("no match: %s\n", reply["reason"].as<std::string>().c_str());
  }
  return match ? 0 : kExitNoMatch;
}

struct DedupOptions {
  std::vector<std::string> files, references;
  bool json = false;
  int threads = 0;
  CLI::Option* threads_option = nullptr;
  ToleranceFlags tolerances;
};

int RunDedup(const DedupOptions& options) {
  int unreadable_files = 0;
  std::string request = "{\"inputs\":" + FileInputsJson(options.files, &unreadable_files) +
                        ",\"references\":" + FileInputsJson(options.references, &unreadable_files) +
                        ",\"tolerances\":" + options.tolerances.Json();
  if (options.threads_option->count()) request += ",\"threads\":" + std::to_string(options.threads);
  request += "}";
  const std::string reply_json = CallJson("Dedup", request);
  const YAML::Node reply = ParseJson(reply_json);
  if (options.json) {
    for (const std::string& entry : JsonArrayElements(reply_json, "entries")) {
      std::cout << entry << '\n';
    }
  } else {
    for (const YAML::Node& entry : reply["entries"]) {
      if (entry["error"] && !entry["error"]["message"].as<std::string>().empty()) {
        std::printf("%-40s  UNREADABLE  %s\n", entry["source"].as<std::string>().c_str(),
                    entry["error"]["message"].as<std::string>().c_str());
        continue;
      }
      const std::string reference = entry["matched_reference"].as<std::string>();
      std::printf("%-40s  group %-5s %-15s %s\n", entry["source"].as<std::string>().c_str(),
                  entry["group"].as<std::string>().c_str(),
                  entry["representative"].as<bool>() ? "representative" : "duplicate",
                  entry["novel"].as<bool>() ? "novel" : ("known: " + reference).c_str());
    }
  }
  const YAML::Node summary = reply["summary"];
  std::fprintf(options.json ? stderr : stdout,
               "\n%s structures: %s unique, %s novel against %s references, %d unreadable\n",
               summary["structures"].as<std::string>().c_str(),
               summary["unique"].as<std::string>().c_str(),
               summary["novel"].as<std::string>().c_str(),
               summary["references"].as<std::string>().c_str(),
               summary["unreadable"].as<int>() + unreadable_files);
  return summary["unreadable"].as<int>() + unreadable_files > 0 ? kExitNoMatch : 0;
}

}  // namespace

void AddMatchCommand(CLI::App& app, std::function<int()>* run) {
  auto options = std::make_shared<MatchOptions>();
  CLI::App* command = app.add_subcommand(
      "match", "Whether two structure files hold the same crystal (exit 0) or not (exit 3)");
  command->add_option("a", options->a, "First structure file")->required();
  command->add_option("b", options->b, "Second structure file")->required();
  command->add_flag("--json", options->json, "Print the reply as protobuf JSON");
  options->tolerances.Add(command);
  command->callback([options, run] { *run = [options] { return RunMatch(*options); }; });
}

void AddDedupCommand(CLI::App& app, std::function<int()>* run) {
  auto options = std::make_shared<DedupOptions>();
  CLI::App* command = app.add_subcommand(
      "dedup", "Group equivalent structures; with --reference, say which are novel");
  command->add_option("files", options->files, "Structure files")->required();
  command->add_option("--reference", options->references,
                      "Known structures to test novelty against (files)");
  command->add_flag("--json", options->json, "One JSON object per structure on stdout");
  options->threads_option = command->add_option("--threads", options->threads,
                                                "Threads (default: all cores)");
  options->tolerances.Add(command);
  command->callback([options, run] { *run = [options] { return RunDedup(*options); }; });
}

}  // namespace nucleate::cli
