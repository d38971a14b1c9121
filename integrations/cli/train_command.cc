#include "train_command.h"

#include <filesystem>
#include <fstream>
#include <iostream>
#include <memory>
#include <sstream>

#include "abi_client.h"
#include "json_reply.h"
#include "interruptible_call.h"

namespace nucleate::cli {
namespace {


std::string ReadFile(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  if (!in) throw std::runtime_error("cannot read '" + path + "'");
  std::ostringstream text;
  text << in.rdbuf();
  return text.str();
}

int RunTrain(const std::string& config, const std::string& log_path,
             const TrainProcesses& processes) {
  const std::string yaml = ReadFile(config);
  const std::filesystem::path path(config);
  const std::string directory = path.has_parent_path() ? path.parent_path().string() : ".";
  const std::string request = "{\"config_yaml\":" + JsonQuote(yaml) +
                              ",\"config_directory\":" + JsonQuote(directory) +
                              ",\"config_name\":" + JsonQuote(config) + "}";
  std::unique_ptr<std::ofstream> log_file;
  if (!log_path.empty() && processes.writes_outputs) {
    log_file = std::make_unique<std::ofstream>(log_path, std::ios::app);
    if (!*log_file) throw std::runtime_error("cannot write '" + log_path + "'");
  }
  bool cancelled = false;
  const std::string reply_json =
      CallWithProgress("Train", request, log_file.get(), &cancelled,
                       /*quiet=*/!processes.writes_outputs, processes.collective);
  if (!processes.writes_outputs) return cancelled ? 1 : 0;
  const YAML::Node reply = ParseJson(reply_json);
  const auto count = [&](const char* key) {
    return reply[key] ? static_cast<long long>(AsDouble(reply[key])) : 0LL;
  };
  std::cout << "structures kept " << count("structures_kept") << ", skipped "
            << count("structures_skipped") << "\n"
            << "split by composition: train " << count("train_count") << ", validation "
            << count("validation_count") << ", test " << count("test_count") << "\n"
            << "parameters " << count("parameters") << ", epochs done " << count("epochs_done")
            << ", steps " << count("steps_done") << "\n";
  if (reply["last_loss"]) std::cout << "last training loss " << AsDouble(reply["last_loss"]) << "\n";
  if (reply["validation_losses"] && reply["validation_losses"].size() > 0) {
    const YAML::Node losses = reply["validation_losses"];
    std::cout << "validation loss " << AsDouble(losses[losses.size() - 1]) << "\n";
  }
  std::cout << "model: " << reply["model_path"].as<std::string>("") << "\n";
  if (cancelled) {
    std::cerr << "nucleate: training cancelled; the model so far is written, and the last "
                 "checkpoint resumes with output.resume: true\n";
    return 1;
  }
  return 0;
}

int RunModelInfo(const std::string& file, bool json) {
  const std::string reply_json = CallJson("ModelInfo", "{\"path\":" + JsonQuote(file) + "}");
  if (json) {
    std::cout << reply_json << '\n';
    return 0;
  }
  const YAML::Node r = ParseJson(reply_json);
  const YAML::Node a = r["architecture"];
  const YAML::Node p = r["provenance"];
  std::cout << "model file " << file << " (format " << r["format_version"].as<std::string>("?")
            << ", " << r["file_bytes"].as<std::string>("?") << " bytes)\n";
  std::cout << "parameters " << r["parameters"].as<std::string>("0") << " in "
            << r["tensors"].size() << " tensors\n";
  std::cout << "network: hidden " << a["hidden"].as<std::string>("?") << ", layers "
            << a["layers"].as<std::string>("?") << ", species "
            << a["species_mode"].as<std::string>("?") << "\n";
  std::cout << "elements (atomic numbers):";
  for (const auto& z : a["elements"]) std::cout << ' ' << z.as<std::string>();
  std::cout << "\nconditions:";
  if (a["condition_composition"].as<bool>(false)) std::cout << " composition";
  if (a["condition_crystal_system"].as<bool>(false)) std::cout << " crystal_system";
  if (a["condition_space_group"].as<bool>(false)) std::cout << " space_group";
  for (const auto& name : a["properties"]) std::cout << " " << name.as<std::string>();
  std::cout << "\ntrained by nucleate " << p["library_version"].as<std::string>("?") << ", seed "
            << p["seed"].as<std::string>("0") << ", " << p["training_steps"].as<std::string>("0")
            << " steps on " << p["train_count"].as<std::string>("0") << " cells\n";
  std::cout << "dataset SHA-256 " << p["dataset_hash"].as<std::string>("") << "\n";
  return 0;
}

}  // namespace

void AddTrainCommand(CLI::App& app, std::function<int()>* run, TrainProcesses processes) {
  auto config = std::make_shared<std::string>();
  auto log = std::make_shared<std::string>();
  CLI::App* command = app.add_subcommand(
      "train", "Train a denoiser from a YAML configuration (keys: core/train/CONFIG.md)");
  command->add_option("--config", *config, "The training configuration (YAML)")->required();
  command->add_option("--log", *log, "Also append the log lines to this file");
  command->callback([=] { *run = [=] { return RunTrain(*config, *log, processes); }; });
}

void AddModelCommand(CLI::App& app, std::function<int()>* run) {
  CLI::App* model = app.add_subcommand("model", "Inspect model files");
  model->require_subcommand(1);
  auto file = std::make_shared<std::string>();
  auto json = std::make_shared<bool>(false);
  CLI::App* info = model->add_subcommand("info", "What a model file holds (fully checked first)");
  info->add_option("file", *file, "The model file")->required();
  info->add_flag("--json", *json, "Print the ModelInfo reply as protobuf JSON");
  info->callback([=] { *run = [=] { return RunModelInfo(*file, *json); }; });
}

}  // namespace nucleate::cli
