#include "assess_command.h"

#include <filesystem>
#include <fstream>
#include <iostream>
#include <map>
#include <memory>
#include <sstream>

#include "abi_client.h"
#include "assess_table.h"
#include "interruptible_call.h"
#include "json_reply.h"
#include "structure_files.h"

namespace nucleate::cli {
namespace {

constexpr int kExitCancelled = 1;

struct AssessFlags {
  std::string model;
  std::string config;
  std::vector<std::string> held_out;
  std::vector<std::string> training;
  std::map<std::string, CLI::Option*> options;  // by flag, to tell which were given
  int compositions = 0;
  int candidates = 0;
  int de_novo = 0;
  std::string sampler;
  long long steps = 0;
  std::uint32_t seed = 0;
  int threads = 0;
  bool json = false;
  std::string log;
};

// Request field -> the flag that sets it, so a refusal names the flag too.
const std::map<std::string, std::string>& FlagOfField() {
  static const std::map<std::string, std::string> flags = {
      {"model_path", "--model"},          {"config_yaml", "--config"},
      {"held_out", "--held-out"},         {"training", "--training"},
      {"compositions", "--compositions"}, {"candidates_per_composition", "--candidates"},
      {"de_novo_count", "--de-novo"},     {"sampler.kind", "--sampler"},
      {"sampler.steps", "--steps"},       {"threads", "--threads"},
  };
  return flags;
}

std::string ReadFile(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  if (!in) throw std::runtime_error("cannot read '" + path + "'");
  std::ostringstream text;
  text << in.rdbuf();
  return text.str();
}

bool Given(const AssessFlags& flags, const std::string& flag) {
  return flags.options.at(flag)->count() > 0;
}

std::string Request(const AssessFlags& flags) {
  std::string request = "{\"model_path\":" + JsonQuote(flags.model);
  if (!flags.config.empty()) {
    const std::filesystem::path path(flags.config);
    request += ",\"config_yaml\":" + JsonQuote(ReadFile(flags.config)) + ",\"config_directory\":" +
               JsonQuote(path.has_parent_path() ? path.parent_path().string() : ".") +
               ",\"config_name\":" + JsonQuote(flags.config);
  }
  int unreadable = 0;
  if (!flags.held_out.empty()) {
    request += ",\"held_out\":" + FileInputsJson(flags.held_out, &unreadable);
  }
  if (!flags.training.empty()) {
    request += ",\"training\":" + FileInputsJson(flags.training, &unreadable);
  }
  if (unreadable > 0) {
    throw std::runtime_error(std::to_string(unreadable) + " structure files could not be read");
  }
  if (Given(flags, "--compositions")) {
    request += ",\"compositions\":" + std::to_string(flags.compositions);
  }
  if (Given(flags, "--candidates")) {
    request += ",\"candidates_per_composition\":" + std::to_string(flags.candidates);
  }
  if (Given(flags, "--de-novo")) request += ",\"de_novo_count\":" + std::to_string(flags.de_novo);
  std::string sampler;
  if (Given(flags, "--sampler")) {
    const std::map<std::string, std::string> kinds = {{"ddpm", "SAMPLER_KIND_DDPM"},
                                                      {"ddim", "SAMPLER_KIND_DDIM"},
                                                      {"pc", "SAMPLER_KIND_PREDICTOR_CORRECTOR"},
                                                      {"ode", "SAMPLER_KIND_PROBABILITY_FLOW"}};
    sampler += "\"kind\":\"" + kinds.at(flags.sampler) + "\"";
  }
  if (Given(flags, "--steps")) {
    sampler += std::string(sampler.empty() ? "" : ",") + "\"steps\":\"" +
               std::to_string(flags.steps) + "\"";
  }
  if (!sampler.empty()) request += ",\"sampler\":{" + sampler + "}";
  request += ",\"seed\":" + std::to_string(flags.seed);
  if (Given(flags, "--threads")) request += ",\"threads\":" + std::to_string(flags.threads);
  return request + "}";
}

// A refused request names the request field ("STATUS: Assess: field: ..."); add the flag.
[[noreturn]] void RethrowWithFlag(const CallFailed& failure) {
  const std::string message = failure.what();
  const std::string marker = "Assess: ";
  const std::size_t start = message.find(marker);
  if (start != std::string::npos) {
    const std::size_t field_start = start + marker.size();
    const std::size_t end = message.find(": ", field_start);
    const std::string field = message.substr(field_start, end - field_start);
    const auto found = FlagOfField().find(field.substr(0, field.find('[')));
    if (end != std::string::npos && found != FlagOfField().end()) {
      throw CallFailed(failure.status(), message + " (set by " + found->second + ")");
    }
  }
  throw failure;
}

int RunAssess(const AssessFlags& flags) {
  if (flags.config.empty() && flags.held_out.empty()) {
    throw CLI::ValidationError("--config",
                               "required: the model's training configuration "
                               "(or --held-out structure files)");
  }
  const std::string request = Request(flags);
  std::unique_ptr<std::ofstream> log_file;
  if (!flags.log.empty()) {
    log_file = std::make_unique<std::ofstream>(flags.log, std::ios::app);
    if (!*log_file) throw std::runtime_error("cannot write the log file '" + flags.log + "'");
    *log_file << "assess " << flags.model << " on "
              << (flags.config.empty() ? "the --held-out files" : flags.config) << std::endl;
  }
  bool cancelled = false;
  std::string reply;
  try {
    reply = CallWithProgress("Assess", request, log_file.get(), &cancelled);
  } catch (const CallFailed& failure) {
    if (log_file) *log_file << "failed: " << failure.what() << std::endl;
    RethrowWithFlag(failure);
  }
  const std::string table = AssessTable(reply);
  if (flags.json) {
    std::cout << reply << '\n';
  } else {
    std::cout << table;
  }
  if (log_file) *log_file << table << std::flush;
  if (cancelled) {
    std::cerr << "nucleate: assessment cancelled; the figures cover what finished (see their "
                 "sample sizes)\n";
    return kExitCancelled;
  }
  return 0;
}

}  // namespace

void AddAssessCommand(CLI::App& app, std::function<int()>* run) {
  auto flags = std::make_shared<AssessFlags>();
  CLI::App* command = app.add_subcommand(
      "assess",
      "Measure a trained model on structures it never saw: match rates of held-out compositions "
      "with 1 and K candidates, validity, charge neutrality, symmetry, uniqueness, novelty and "
      "distribution distances, each with its sample size. Candidates are hypotheses. Exit 0 when "
      "done, 1 when refused or cancelled (the figures of what finished are printed), 2 for a "
      "command-line mistake");
  command->add_option("--model", flags->model, "The model file written by nucleate train")
      ->required()
      ->type_name("FILE");
  CLI::Option* config =
      command
          ->add_option("--config", flags->config,
                       "The model's training configuration: its test split is held out, its "
                       "training split is the reference for novelty")
          ->type_name("FILE");
  CLI::Option* held_out =
      command
          ->add_option("--held-out", flags->held_out,
                       "Instead of --config: held-out structure files (CIF, extended XYZ, JSON)")
          ->type_name("FILE")
          ->excludes(config);
  command
      ->add_option("--training", flags->training,
                   "With --held-out: training structure files, for novelty")
      ->type_name("FILE")
      ->needs(held_out);
  flags->options["--compositions"] =
      command
          ->add_option("--compositions", flags->compositions,
                       "Held-out compositions assessed, the first N by formula (100)")
          ->type_name("N");
  flags->options["--candidates"] =
      command->add_option("--candidates", flags->candidates, "Candidates per composition, K (20)")
          ->type_name("K");
  flags->options["--de-novo"] =
      command
          ->add_option("--de-novo", flags->de_novo,
                       "De novo candidates, for models trained with species: absorbing (0)")
          ->type_name("D");
  flags->options["--sampler"] =
      command
          ->add_option("--sampler", flags->sampler,
                       "ddpm, ddim, pc (predictor-corrector) or ode (ddpm)")
          ->type_name("NAME")
          ->check(CLI::IsMember({"ddpm", "ddim", "pc", "ode"}));
  flags->options["--steps"] =
      command
          ->add_option("--steps", flags->steps,
                       "Reverse steps, evenly respaced (default: the model's)")
          ->type_name("N");
  command->add_option("--seed", flags->seed, "Random seed, 0..4294967295 (0)")->type_name("S");
  flags->options["--threads"] =
      command
          ->add_option("--threads", flags->threads,
                       "Threads, 0 = every core (0); the figures do not depend on it")
          ->type_name("T");
  command->add_flag("--json", flags->json,
                    "Print the Assess reply (protobuf JSON) instead of the table");
  command
      ->add_option("--log", flags->log,
                   "Also append progress, log lines and the table to this file")
      ->type_name("FILE");
  command->callback([flags, run] { *run = [flags] { return RunAssess(*flags); }; });
}

}  // namespace nucleate::cli
