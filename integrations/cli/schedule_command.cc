#include "schedule_command.h"

#include <algorithm>
#include <cstdio>
#include <cstring>
#include <fstream>
#include <iterator>
#include <iostream>
#include <map>
#include <memory>
#include <sstream>

#include "abi_client.h"
#include "json_reply.h"
#include "svg_plot.h"

namespace nucleate::cli {
namespace {

enum class Family { kVariance, kSigma, kTransition };

struct KindInfo {
  Family family;
  const char* enum_name;  // the proto enum value
};

const std::map<std::string, KindInfo>& Kinds() {
  static const std::map<std::string, KindInfo> kKinds = {
      {"linear", {Family::kVariance, "VARIANCE_KIND_LINEAR"}},
      {"cosine", {Family::kVariance, "VARIANCE_KIND_COSINE"}},
      {"sigmoid", {Family::kVariance, "VARIANCE_KIND_SIGMOID"}},
      {"log-snr-linear", {Family::kVariance, "VARIANCE_KIND_LOG_SNR_LINEAR"}},
      {"geometric", {Family::kSigma, "SIGMA_KIND_GEOMETRIC"}},
      {"karras", {Family::kSigma, "SIGMA_KIND_KARRAS"}},
      {"uniform", {Family::kTransition, "TRANSITION_KIND_UNIFORM"}},
      {"absorbing", {Family::kTransition, "TRANSITION_KIND_ABSORBING"}},
  };
  return kKinds;
}

const char* FamilyField(Family family) {
  switch (family) {
    case Family::kVariance: return "variance";
    case Family::kSigma: return "sigma";
    case Family::kTransition: return "transition";
  }
  return "";
}

// A numeric flag and the request field it fills.
struct NumberFlag {
  const char* flag;
  const char* field;
  Family family;
  const char* help;
  double value = 0;
  CLI::Option* option = nullptr;
};

// The rows and columns of the reply to print, per family. Columns are fixed so the CSV header
// does not depend on the values.
struct TableLayout {
  const char* rows;
  std::vector<const char*> columns;
};

TableLayout LayoutFor(Family family) {
  switch (family) {
    case Family::kVariance:
      return {"variance_steps",
              {"t", "source_t", "beta", "alpha", "alpha_bar", "sqrt_alpha_bar",
               "sqrt_one_minus_alpha_bar", "snr", "log_snr", "posterior_variance",
               "posterior_log_variance_clipped", "posterior_mean_coef_x0",
               "posterior_mean_coef_xt"}};
    case Family::kSigma:
      return {"sigma_levels",
              {"t", "sigma", "tv_distance_to_uniform", "images", "density_relative_error_bound",
               "score_absolute_error_bound"}};
    case Family::kTransition:
      return {"transition_steps", {"t", "beta", "alpha_bar"}};
  }
  return {"", {}};
}

struct ScheduleOptions {
  std::string kind = "cosine";
  long long steps = 1000;
  std::string design;  // a DesignSchedule reply (nucleate design --json) to start from
  std::string format = "csv";
  std::string plot;
  bool zero_terminal_snr = false;
  std::string retention;
  std::vector<NumberFlag> numbers;
  CLI::Option* kind_option = nullptr;
  CLI::Option* steps_option = nullptr;
};

// The family block of a saved design, as request fields. Protobuf JSON reads numbers given as
// strings, so every scalar is passed on as its reply text; only booleans must stay bare.
std::map<std::string, std::string> FieldsFromDesign(const std::string& path, Family family) {
  std::ifstream file(path);
  if (!file) throw std::runtime_error("cannot read the design file '" + path + "'");
  const std::string text{std::istreambuf_iterator<char>(file), std::istreambuf_iterator<char>()};
  const YAML::Node block = ParseJson(text)[FamilyField(family)];
  if (!block || !block.IsMap()) {
    throw std::runtime_error("'" + path + "' holds no '" + FamilyField(family) +
                             "' schedule; write it with: nucleate design --json");
  }
  std::map<std::string, std::string> fields;
  for (const auto& entry : block) {
    const std::string value = entry.second.as<std::string>();
    fields[entry.first.as<std::string>()] =
        value == "true" || value == "false" ? value : JsonQuote(value);
  }
  return fields;
}

std::string BuildRequest(const ScheduleOptions& options, const KindInfo& kind) {
  std::map<std::string, std::string> fields;
  if (!options.design.empty()) fields = FieldsFromDesign(options.design, kind.family);
  if (options.design.empty() || options.kind_option->count() > 0) {
    fields["kind"] = JsonQuote(kind.enum_name);
  }
  if (options.steps_option->count() > 0) fields["steps"] = std::to_string(options.steps);
  for (const NumberFlag& number : options.numbers) {
    if (number.option->count() == 0) continue;
    if (number.family != kind.family) {
      throw CLI::ValidationError(std::string("--") + number.flag,
                                 "does not apply to --kind " + options.kind);
    }
    fields[number.field] = JsonNumber(number.value);
  }
  if (options.zero_terminal_snr) {
    if (kind.family != Family::kVariance) {
      throw CLI::ValidationError("--zero-terminal-snr", "applies to variance-preserving kinds");
    }
    fields["zero_terminal_snr"] = "true";
  }
  if (!options.retention.empty()) {
    if (kind.family != Family::kTransition) {
      throw CLI::ValidationError("--retention", "applies to --kind uniform or absorbing");
    }
    fields["retention"] = options.retention == "cosine" ? "\"RETENTION_KIND_COSINE\""
                                                        : "\"RETENTION_KIND_RECIPROCAL\"";
  }
  std::string body;
  for (const auto& [name, value] : fields) {
    body += (body.empty() ? "" : ",") + JsonQuote(name) + ":" + value;
  }
  return std::string("{\"") + FamilyField(kind.family) + "\":{" + body + "}}";
}

void PrintTable(const YAML::Node& rows, const TableLayout& layout, const std::string& format) {
  const bool csv = format == "csv";
  // Readable table: each column as wide as its name, at least a %.6g number wide.
  std::vector<int> widths;
  for (const char* column : layout.columns) {
    widths.push_back(std::max<int>(12, static_cast<int>(std::strlen(column))));
  }
  for (size_t c = 0; c < layout.columns.size(); ++c) {
    if (csv) {
      std::cout << (c ? "," : "") << layout.columns[c];
    } else {
      std::printf("%s%*s", c ? " " : "", widths[c], layout.columns[c]);
    }
  }
  std::cout << '\n';
  for (const YAML::Node& row : rows) {
    for (size_t c = 0; c < layout.columns.size(); ++c) {
      const YAML::Node cell = row[layout.columns[c]];
      if (csv) {
        // The reply's own text: shortest round-trip digits, no precision lost.
        std::cout << (c ? "," : "") << (cell ? cell.as<std::string>() : "");
      } else {
        std::printf("%s%*.6g", c ? " " : "", widths[c], cell ? AsDouble(cell) : 0.0);
      }
    }
    std::cout << '\n';
  }
  std::cout.flush();
}

void Plot(const YAML::Node& rows, Family family, const std::string& kind,
          const std::string& path) {
  PlotSeries series;
  PlotSpec spec;
  spec.x_label = "step t";
  const char* x_field = "t";
  const char* y_field = "log_snr";
  switch (family) {
    case Family::kVariance:
      series.name = "log-SNR";
      spec.y_label = "log SNR = log(alpha_bar / (1 - alpha_bar))";
      // A respaced schedule is drawn where its steps sit in the original one.
      x_field = "source_t";
      spec.x_label = "step t of the original schedule";
      break;
    case Family::kSigma:
      y_field = "sigma";
      series.name = "sigma";
      spec.y_label = "sigma (fractional coordinates)";
      spec.log_y = true;
      break;
    case Family::kTransition:
      y_field = "alpha_bar";
      series.name = "alpha_bar";
      spec.y_label = "probability of keeping the original class";
      break;
  }
  spec.title = "nucleate schedule: " + kind;
  for (const YAML::Node& row : rows) {
    series.x.push_back(AsDouble(row[x_field]));
    series.y.push_back(AsDouble(row[y_field]));
  }
  WriteSvgPlot(path, spec, {series});
}

int RunSchedule(const ScheduleOptions& options) {
  // With a design and no --kind, the design's variance schedule is shown.
  const bool from_design_variance = !options.design.empty() && options.kind_option->count() == 0;
  const KindInfo& kind = Kinds().at(from_design_variance ? "log-snr-linear" : options.kind);
  const std::string title = from_design_variance ? "designed variance schedule" : options.kind;
  const std::string reply_json = CallJson("Schedule", BuildRequest(options, kind));
  if (options.format == "json") {
    std::cout << reply_json << '\n';
  }
  const YAML::Node reply = ParseJson(reply_json);
  const TableLayout layout = LayoutFor(kind.family);
  const YAML::Node rows = reply[layout.rows];
  if (options.format != "json") PrintTable(rows, layout, options.format);
  if (!options.plot.empty()) Plot(rows, kind.family, title, options.plot);
  return 0;
}

}  // namespace

void AddScheduleCommand(CLI::App& app, std::function<int()>* run) {
  auto options = std::make_shared<ScheduleOptions>();
  CLI::App* command = app.add_subcommand(
      "schedule", "Print a noise schedule, one row per step (t = 1..T)");
  std::vector<std::string> kind_names;
  for (const auto& entry : Kinds()) kind_names.push_back(entry.first);
  options->kind_option = command->add_option("--kind", options->kind, "Schedule kind")
                             ->check(CLI::IsMember(kind_names))
                             ->capture_default_str();
  options->steps_option = command->add_option("--steps", options->steps, "Number of steps T")
                              ->capture_default_str();
  command->add_option("--design", options->design,
                      "Start from a design saved by 'nucleate design --json' (its variance "
                      "schedule, or its sigma ladder with --kind geometric/karras); flags override")
      ->check(CLI::ExistingFile);
  command->add_option("--format", options->format, "Output format")
      ->check(CLI::IsMember({"csv", "json", "table"}))
      ->capture_default_str();
  command->add_option("--plot", options->plot, "Also draw the schedule into this SVG file");
  command->add_flag("--zero-terminal-snr", options->zero_terminal_snr,
                    "Rescale so alpha_bar_T = 0 (Lin et al. 2024)");
  command->add_option("--retention", options->retention,
                      "Discrete kinds: how alpha_bar falls (default reciprocal)")
      ->check(CLI::IsMember({"reciprocal", "cosine"}));
  options->numbers = {
      {"beta-start", "beta_start", Family::kVariance, "linear: first beta (1e-4)"},
      {"beta-end", "beta_end", Family::kVariance, "linear: last beta (0.02)"},
      {"cosine-offset", "cosine_offset", Family::kVariance, "cosine: offset s (0.008)"},
      {"max-beta", "max_beta", Family::kVariance, "cosine, sigmoid: beta clip (0.999)"},
      {"sigmoid-start", "sigmoid_start", Family::kVariance, "sigmoid: start (-3)"},
      {"sigmoid-end", "sigmoid_end", Family::kVariance, "sigmoid: end (3)"},
      {"sigmoid-tau", "sigmoid_tau", Family::kVariance, "sigmoid: temperature (1)"},
      {"log-snr-max", "log_snr_max", Family::kVariance, "log-snr-linear: at t = 0 (10)"},
      {"log-snr-min", "log_snr_min", Family::kVariance, "log-snr-linear: at t = T (-10)"},
      {"log-snr-shift", "log_snr_shift", Family::kVariance, "added to log-SNR (0)"},
      {"respace", "respaced_steps", Family::kVariance, "keep this many evenly spaced steps"},
      {"sigma-min", "sigma_min", Family::kSigma, "smallest sigma (0.005)"},
      {"sigma-max", "sigma_max", Family::kSigma, "largest sigma (0.5)"},
      {"rho", "rho", Family::kSigma, "karras: exponent (7)"},
      {"classes", "num_classes", Family::kTransition, "discrete: number of classes K"},
  };
  for (NumberFlag& number : options->numbers) {
    number.option = command->add_option(std::string("--") + number.flag, number.value, number.help);
  }
  command->callback([options, run] { *run = [options] { return RunSchedule(*options); }; });
}

}  // namespace nucleate::cli
