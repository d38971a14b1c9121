#include "convert_command.h"

#include <fstream>
#include <iostream>
#include <map>
#include <memory>

#include "abi_client.h"
#include "json_reply.h"
#include "structure_files.h"

namespace nucleate::cli {
namespace {

constexpr int kExitSomeUnreadable = 3;

struct ConvertOptions {
  std::vector<std::string> files;
  std::string to = "cif";
  std::string out;  // empty: stdout
  double symprec = 0.1;
  CLI::Option* symprec_option = nullptr;
};

int RunConvert(const ConvertOptions& options) {
  static const std::map<std::string, std::string> kFormats = {
      {"cif", "STRUCTURE_FORMAT_CIF"},
      {"cif-symmetrised", "STRUCTURE_FORMAT_CIF_SYMMETRISED"},
      {"extxyz", "STRUCTURE_FORMAT_EXTXYZ"},
      {"json", "STRUCTURE_FORMAT_JSON"}};
  int unreadable_files = 0;
  std::string request = "{\"inputs\":" + FileInputsJson(options.files, &unreadable_files) +
                        ",\"format\":\"" + kFormats.at(options.to) + "\"";
  if (options.symprec_option->count()) request += ",\"symprec\":" + JsonNumber(options.symprec);
  request += "}";
  const std::string reply_json = CallJson("Convert", request);
  const YAML::Node reply = ParseJson(reply_json);
  std::string output;
  if (options.to == "json") {
    for (const std::string& structure : JsonArrayElements(reply_json, "structures")) {
      output += structure + "\n";
    }
  } else {
    output = reply["text"].as<std::string>();
  }
  if (options.out.empty()) {
    std::cout << output;
  } else {
    std::ofstream file(options.out, std::ios::binary);
    file << output;
    if (!file) throw std::runtime_error("cannot write '" + options.out + "'");
  }
  int unreadable = unreadable_files;
  for (const YAML::Node& issue : reply["unreadable"]) {
    std::cerr << "nucleate: " << issue["error"]["message"].as<std::string>() << '\n';
    ++unreadable;
  }
  return unreadable > 0 ? kExitSomeUnreadable : 0;
}

}  // namespace

void AddConvertCommand(CLI::App& app, std::function<int()>* run) {
  auto options = std::make_shared<ConvertOptions>();
  CLI::App* command = app.add_subcommand(
      "convert", "Rewrite structure files (CIF, extended XYZ, JSON) in one format");
  command->add_option("files", options->files, "Structure files")->required();
  command->add_option("--to", options->to, "Output format")
      ->check(CLI::IsMember({"cif", "cif-symmetrised", "extxyz", "json"}))
      ->capture_default_str();
  command->add_option("--out", options->out, "Output file (default: stdout)");
  options->symprec_option = command->add_option(
      "--symprec", options->symprec, "Symmetry tolerance for cif-symmetrised, angstrom (0.1)");
  command->callback([options, run] { *run = [options] { return RunConvert(*options); }; });
}

}  // namespace nucleate::cli
