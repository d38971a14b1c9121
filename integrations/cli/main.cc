// nucleate: the command-line face of libnucleate. Exit 0 on success; 1 when the library refused
// or failed a request (its one-line message on stderr); 2 for a command-line mistake.
#include <functional>
#include <iostream>
#include <iterator>
#include <string>

#include <CLI/CLI.hpp>

#include "abi_client.h"
#include "assess_command.h"
#include "check_command.h"
#include "convert_command.h"
#include "match_command.h"
#include "design_command.h"
#include "nucleate/nucleate.h"
#include "sample_command.h"
#include "schedule_command.h"
#include "train_command.h"

namespace {

constexpr int kExitFailed = 1;
constexpr int kExitUsage = 2;

void AddVersionCommand(CLI::App& app, std::function<int()>* run) {
  CLI::App* command = app.add_subcommand("version", "Print the library version");
  command->callback([run] {
    *run = [] {
      std::cout << "nucleate " << nucleate_version() << " (ABI " << nucleate_abi_version()
                << ")\n";
      return 0;
    };
  });
}

void AddCallCommand(CLI::App& app, std::function<int()>* run) {
  auto method = std::make_shared<std::string>();
  CLI::App* command = app.add_subcommand(
      "call", "Call METHOD with a protobuf JSON request on stdin; the reply goes to stdout");
  command->add_option("method", *method, "Method name, e.g. Schedule")->required();
  command->callback([method, run] {
    *run = [method] {
      const std::string request{std::istreambuf_iterator<char>(std::cin),
                                std::istreambuf_iterator<char>()};
      std::cout << nucleate::cli::CallJson(*method, request) << '\n';
      return 0;
    };
  });
}

}  // namespace

int main(int argc, char** argv) {
  CLI::App app{"nucleate: design noise schedules; train denoisers; sample candidates; assess models; check, match, deduplicate and convert crystal structures"};
  app.require_subcommand(1);
  std::function<int()> run;
  AddVersionCommand(app, &run);
  AddCallCommand(app, &run);
  nucleate::cli::AddScheduleCommand(app, &run);
  nucleate::cli::AddDesignCommand(app, &run);
  nucleate::cli::AddCheckCommand(app, &run);
  nucleate::cli::AddMatchCommand(app, &run);
  nucleate::cli::AddDedupCommand(app, &run);
  nucleate::cli::AddConvertCommand(app, &run);
  nucleate::cli::AddTrainCommand(app, &run);
  nucleate::cli::AddModelCommand(app, &run);
  nucleate::cli::AddSampleCommand(app, &run);
  nucleate::cli::AddAssessCommand(app, &run);
  try {
    app.parse(argc, argv);
  } catch (const CLI::CallForHelp& help) {
    return app.exit(help);
  } catch (const CLI::ParseError& error) {
    app.exit(error);
    return kExitUsage;
  }
  try {
    return run();
  } catch (const CLI::ParseError& error) {
    std::cerr << "nucleate: " << error.get_name() << ": " << error.what() << '\n';
    return kExitUsage;
  } catch (const std::exception& error) {
    std::cerr << "nucleate: " << error.what() << '\n';
    return kExitFailed;
  }
}
