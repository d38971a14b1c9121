#include "design_command.h"

#include <cstdio>
#include <iostream>
#include <map>
#include <memory>
#include <sstream>

#include "abi_client.h"
#include "json_reply.h"

namespace nucleate::cli {
namespace {

struct DesignOptions {
  std::string variance_kind = "log-snr-linear";
  std::string sigma_kind = "geometric";
  bool json = false;
  // flag, request field, value, option
  struct Number {
    const char* flag;
    const char* field;
    const char* help;
    double value = 0;
    CLI::Option* option = nullptr;
  };
  std::vector<Number> numbers;
};

void PrintSection(const char* title, const YAML::Node& node) {
  std::printf("%s\n", title);
  for (const auto& entry : node) {
    std::printf("  %-32s %s\n", entry.first.as<std::string>().c_str(),
                entry.second.as<std::string>().c_str());
  }
}

int RunDesign(const DesignOptions& options) {
  std::ostringstream request;
  static const std::map<std::string, std::string> kVarianceKinds = {
      {"linear", "VARIANCE_KIND_LINEAR"},
      {"cosine", "VARIANCE_KIND_COSINE"},
      {"sigmoid", "VARIANCE_KIND_SIGMOID"},
      {"log-snr-linear", "VARIANCE_KIND_LOG_SNR_LINEAR"}};
  request << "{\"variance_kind\":\"" << kVarianceKinds.at(options.variance_kind)
          << "\",\"sigma_kind\":\"SIGMA_KIND_"
          << (options.sigma_kind == "karras" ? "KARRAS" : "GEOMETRIC") << "\"";
  for (const auto& number : options.numbers) {
    if (number.option->count() > 0) {
      request << ",\"" << number.field << "\":" << JsonNumber(number.value);
    }
  }
  request << "}";
  const std::string reply_json = CallJson("DesignSchedule", request.str());
  if (options.json) {
    std::cout << reply_json << '\n';
    return 0;
  }
  const YAML::Node reply = ParseJson(reply_json);
  PrintSection("variance-preserving schedule (pass to: nucleate schedule)", reply["variance"]);
  PrintSection("sigma schedule for fractional coordinates", reply["sigma"]);
  PrintSection("diagnostics", reply["diagnostics"]);
  return 0;
}

}  // namespace

void AddDesignCommand(CLI::App& app, std::function<int()>* run) {
  auto options = std::make_shared<DesignOptions>();
  CLI::App* command =
      app.add_subcommand("design", "Choose schedule parameters from targets and report them");
  command->add_option("--variance-kind", options->variance_kind, "Gaussian schedule kind")
      ->check(CLI::IsMember({"linear", "cosine", "sigmoid", "log-snr-linear"}))
      ->capture_default_str();
  command->add_option("--sigma-kind", options->sigma_kind, "Sigma ladder kind")
      ->check(CLI::IsMember({"geometric", "karras"}))
      ->capture_default_str();
  command->add_flag("--json", options->json, "Print the reply as protobuf JSON");
  options->numbers = {
      {"steps", "steps", "number of steps (1000)"},
      {"terminal-snr", "terminal_snr", "SNR wanted at t = T (1e-4)"},
      {"initial-snr", "initial_snr", "SNR wanted at t = 1, linear kinds (1e4)"},
      {"tv-distance", "tv_distance", "distance to uniform wanted at sigma_max (0.005)"},
      {"resolution", "resolution_angstrom", "finest displacement in angstrom (0.02)"},
      {"cell-length", "cell_length_angstrom", "typical cell axis in angstrom (5)"},
  };
  for (auto& number : options->numbers) {
    number.option = command->add_option(std::string("--") + number.flag, number.value, number.help);
  }
  command->callback([options, run] { *run = [options] { return RunDesign(*options); }; });
}

}  // namespace nucleate::cli
