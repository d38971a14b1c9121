#include "sample_command.h"

#include <cstdio>
#include <filesystem>
#include <fstream>
#include <iostream>
#include <map>
#include <memory>

#include "abi_client.h"
#include "interruptible_call.h"
#include "sample_job_file.h"
#include "sample_outputs.h"
#include "sample_reply.h"
#include "sample_request.h"
#include "sample_settings.h"
#include "sample_table.h"

namespace nucleate::cli {
namespace {

// Exit code beyond main's (0, 1 refused or cancelled, 2 command-line mistake): every sample ran,
// but some failed with an error (their rows say why).
constexpr int kExitSomeFailed = 3;
constexpr int kExitCancelled = 1;

// Storage for the flags, filled by CLI11.
struct SampleFlags {
  std::string job;
  std::map<std::string, std::string> values;  // by key; switches are not stored here
  std::map<std::string, bool> switches;
  std::vector<std::string> properties;  // NAME=VALUE
  std::map<std::string, CLI::Option*> options;
};

SampleSettings CommandLineSettings(const SampleFlags& flags) {
  SampleSettings settings;
  for (const SettingSpec& spec : SampleSettingSpecs()) {
    const std::string key = spec.key;
    if (spec.kind == SettingKind::kProperties || flags.options.at(key)->count() == 0) continue;
    const std::string text = spec.kind == SettingKind::kSwitch ? "true" : flags.values.at(key);
    settings.values[key] = {text, FlagName(key)};
  }
  for (const std::string& property : flags.properties) {
    const std::size_t equals = property.find('=');
    if (equals == std::string::npos || equals == 0) {
      throw CLI::ValidationError("--property", "expected NAME=VALUE, got '" + property + "'");
    }
    const std::string name = property.substr(0, equals);
    settings.properties[name] = {property.substr(equals + 1), "--property " + name};
  }
  return settings;
}

// A refused request names the request field; say which flag or job-file line set it.
[[noreturn]] void RethrowWithOrigin(const CallFailed& failure, const SamplePlan& plan) {
  const std::string origin = plan.FieldOrigin(failure.what());
  if (origin.empty()) throw failure;
  throw CallFailed(failure.status(), std::string(failure.what()) + " (set by " + origin + ")");
}

int RunSample(const SampleFlags& flags, const SampleCaller& caller) {
  const SampleSettings command_line = CommandLineSettings(flags);
  const SampleSettings settings =
      flags.job.empty() ? command_line : MergeSettings(ReadSampleJobFile(flags.job), command_line);
  const SamplePlan plan = PlanSample(settings);
  if (!caller.writes_outputs) {
    bool cancelled = false;
    caller.call(settings, plan, nullptr, &cancelled);
    return 0;
  }
  const bool created_out_dir = PrepareOutputFolder(plan);

  std::unique_ptr<std::ofstream> log_file;
  if (!plan.output.log_path.empty()) {
    log_file = std::make_unique<std::ofstream>(plan.output.log_path, std::ios::app);
    if (!*log_file)
      throw std::runtime_error("cannot write the log file '" + plan.output.log_path + "'");
    *log_file << plan.description << std::endl;
  }
  bool cancelled = false;
  std::string reply_json;
  try {
    reply_json = caller.call(settings, plan, log_file.get(), &cancelled);
  } catch (const CallFailed& failure) {
    if (log_file) *log_file << "failed: " << failure.what() << std::endl;
    std::error_code ignored;  // a refused request leaves no empty folder behind
    if (created_out_dir) std::filesystem::remove(plan.output.out_dir, ignored);
    RethrowWithOrigin(failure, plan);
  }

  SampleResult result = ReadSampleReply(reply_json);
  const std::vector<std::string> written = WriteSampleOutputs(plan.output, &result);
  const std::string counts = SampleCountsLine(result);
  const std::string files =
      std::to_string(written.size()) + " files written to " + plan.output.out_dir;
  if (plan.output.json) {
    std::cout << reply_json << '\n';
    std::cerr << counts << "\n" << files << "\n";
  } else {
    PrintSampleTable(result, stdout);
    std::printf("%s\n", files.c_str());
    std::fflush(stdout);
  }
  if (log_file) *log_file << counts << "\n" << files << "\n" << result.caution << std::endl;

  const long long failed = SummaryCount(result, "failed");
  if (cancelled) {
    const std::string kept =
        "sampling cancelled: kept " + std::to_string(SummaryCount(result, "finished")) + " of " +
        std::to_string(plan.count) + " candidates in " + plan.output.out_dir +
        (failed > 0 ? " (" + std::to_string(failed) + " of them failed)" : "");
    if (log_file) *log_file << kept << std::endl;
    std::cerr << "nucleate: " << kept << "\n";
    return kExitCancelled;
  }
  if (failed > 0) {
    std::cerr << "nucleate: " << failed << " of " << plan.count
              << " samples failed; their rows and summary.jsonl say why\n";
    return kExitSomeFailed;
  }
  return 0;
}

}  // namespace

std::string CallSampleHere(const SampleSettings&, const SamplePlan& plan, std::ostream* log,
                           bool* cancelled) {
  return CallWithProgress("Sample", plan.request_json, log, cancelled);
}

void AddSampleCommand(CLI::App& app, std::function<int()>* run, SampleCaller caller) {
  auto flags = std::make_shared<SampleFlags>();
  CLI::App* command = app.add_subcommand(
      "sample",
      "Generate candidate structures from a trained model into --out (sample-<index>.cif, "
      "candidates.xyz, summary.jsonl). Candidates are hypotheses: check them with DFT. Exit 0 "
      "when every sample finished, 3 when some failed, 1 when refused or cancelled (what was "
      "finished is written), 2 for a command-line mistake");
  command
      ->add_option(
          "--job", flags->job,
          "A YAML job file with the settings below (keys: integrations/cli/SAMPLE_JOB.md); "
          "flags override it")
      ->type_name("FILE");
  for (const SettingSpec& spec : SampleSettingSpecs()) {
    const std::string key = spec.key;
    const std::string flag = FlagName(key);
    CLI::Option* option = nullptr;
    switch (spec.kind) {
      case SettingKind::kValue:
      case SettingKind::kList:
        option =
            command->add_option(flag, flags->values[key], spec.help)->type_name(spec.value_name);
        break;
      case SettingKind::kSwitch:
        option = command->add_flag(flag, flags->switches[key], spec.help);
        break;
      case SettingKind::kProperties:
        option = command->add_option(flag, flags->properties, spec.help)
                     ->type_name(spec.value_name)
                     ->expected(1)
                     ->multi_option_policy(CLI::MultiOptionPolicy::TakeAll);
        break;
    }
    flags->options[key] = option;
  }
  command->callback(
      [flags, run, caller] { *run = [flags, caller] { return RunSample(*flags, caller); }; });
}

}  // namespace nucleate::cli
