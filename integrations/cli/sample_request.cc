#include "sample_request.h"

#include <CLI/CLI.hpp>
#include <cerrno>
#include <cstdlib>
#include <limits>
#include <utility>
#include <vector>

#include "abi_client.h"
#include "element_lookup.h"
#include "json_reply.h"
#include "structure_files.h"

namespace nucleate::cli {
namespace {

constexpr long long kUint32Max = std::numeric_limits<std::uint32_t>::max();
constexpr long long kInt32Max = std::numeric_limits<std::int32_t>::max();
constexpr long long kInt32Min = std::numeric_limits<std::int32_t>::min();

// Members of a JSON object in the order added.
class JsonObject {
 public:
  void Add(const std::string& key, const std::string& json) {
    text_ += (text_.empty() ? "" : ",") + JsonQuote(key) + ":" + json;
  }
  bool Empty() const { return text_.empty(); }
  std::string Text() const { return "{" + text_ + "}"; }

 private:
  std::string text_;
};

std::string JsonArray(const std::vector<long long>& numbers) {
  std::string text;
  for (long long n : numbers) text += (text.empty() ? "" : ",") + std::to_string(n);
  return "[" + text + "]";
}

long long WholeNumber(const Setting& s, long long min, long long max) {
  const char* begin = s.text.c_str();
  char* end = nullptr;
  errno = 0;
  const long long value = std::strtoll(begin, &end, 10);
  if (s.text.empty() || end == begin || *end != '\0' || errno == ERANGE) {
    throw CLI::ValidationError(s.origin, "expected a whole number, got '" + s.text + "'");
  }
  if (value < min || value > max) {
    throw CLI::ValidationError(s.origin, "must lie in " + std::to_string(min) + ".." +
                                             std::to_string(max) + ", got " + s.text);
  }
  return value;
}

double RealNumber(const Setting& s) {
  const char* begin = s.text.c_str();
  char* end = nullptr;
  const double value = std::strtod(begin, &end);
  if (s.text.empty() || end == begin || *end != '\0') {
    throw CLI::ValidationError(s.origin, "expected a number, got '" + s.text + "'");
  }
  return value;
}

bool Switch(const Setting& s) {
  if (s.text == "true") return true;
  if (s.text == "false") return false;
  throw CLI::ValidationError(s.origin, "expected true or false, got '" + s.text + "'");
}

// "N" or "MIN-MAX".
std::pair<long long, long long> Range(const Setting& s) {
  const std::size_t dash = s.text.find('-', 1);
  if (dash == std::string::npos) {
    const long long n = WholeNumber(s, kInt32Min, kInt32Max);
    return {n, n};
  }
  try {
    const long long low = WholeNumber({s.text.substr(0, dash), s.origin}, kInt32Min, kInt32Max);
    const long long high = WholeNumber({s.text.substr(dash + 1), s.origin}, kInt32Min, kInt32Max);
    return {low, high};
  } catch (const CLI::ValidationError&) {
    throw CLI::ValidationError(s.origin, "expected N or MIN-MAX, got '" + s.text + "'");
  }
}

std::vector<std::string> Items(const Setting& s) {
  std::vector<std::string> items;
  std::size_t start = 0;
  while (true) {
    const std::size_t comma = s.text.find(',', start);
    std::string item =
        s.text.substr(start, comma == std::string::npos ? std::string::npos : comma - start);
    const std::size_t first = item.find_first_not_of(" \t");
    const std::size_t last = item.find_last_not_of(" \t");
    item = first == std::string::npos ? "" : item.substr(first, last - first + 1);
    if (item.empty()) throw CLI::ValidationError(s.origin, "has an empty entry: '" + s.text + "'");
    items.push_back(item);
    if (comma == std::string::npos) break;
    start = comma + 1;
  }
  return items;
}

std::string Choice(const Setting& s,
                   const std::vector<std::pair<std::string, std::string>>& names) {
  std::string known;
  for (const auto& [name, enum_name] : names) {
    if (s.text == name) return JsonQuote(enum_name);
    known += (known.empty() ? "" : ", ") + name;
  }
  throw CLI::ValidationError(s.origin, "'" + s.text + "' is not one of " + known);
}

int CrystalSystem(const Setting& s) {
  static const char* const kNames[] = {"triclinic", "monoclinic", "orthorhombic", "tetragonal",
                                       "trigonal",  "hexagonal",  "cubic"};
  for (int i = 0; i < 7; ++i) {
    if (s.text == kNames[i]) return i + 1;
  }
  if (!s.text.empty() && s.text.find_first_not_of("0123456789") == std::string::npos) {
    return static_cast<int>(WholeNumber(s, 1, 7));
  }
  throw CLI::ValidationError(s.origin, "'" + s.text +
                                           "' is not a crystal system (triclinic, monoclinic, "
                                           "orthorhombic, tetragonal, trigonal, hexagonal, cubic "
                                           "or 1..7)");
}

// {"file": ...} for the structure named by a task setting.
std::string StructureInput(const Setting& s) {
  try {
    return FileInputJson(s.text);
  } catch (const std::runtime_error& error) {
    throw CLI::ValidationError(s.origin, error.what());
  }
}

// The atoms in the one structure of `input` (read by the library).
long long AtomCount(const std::string& input, const Setting& s) {
  const YAML::Node reply = ParseJson(
      CallJson("Convert", "{\"inputs\":[" + input + "],\"format\":\"STRUCTURE_FORMAT_JSON\"}"));
  for (const YAML::Node& issue : reply["unreadable"]) {
    throw CLI::ValidationError(s.origin, issue["error"]["message"].as<std::string>(""));
  }
  const YAML::Node structures = reply["structures"];
  if (!structures || structures.size() != 1) {
    throw CLI::ValidationError(s.origin, s.text + " holds " +
                                             std::to_string(structures ? structures.size() : 0) +
                                             " structures; the task needs exactly one");
  }
  return static_cast<long long>(structures[0]["atomic_numbers"].size());
}

class RequestBuilder {
 public:
  explicit RequestBuilder(const SampleSettings& settings) : settings_(settings) {}

  const Setting* Get(const std::string& key) const {
    const auto found = settings_.values.find(key);
    return found == settings_.values.end() ? nullptr : &found->second;
  }

  // Records where a request field came from, for the library's messages.
  void From(const std::string& field, const Setting& s) { plan_.origins[field] = s.origin; }

  SamplePlan Build() {
    const std::string task = settings_.Task();
    for (const auto& [key, setting] : settings_.values) {
      const SettingSpec* spec = FindSampleSetting(key);
      if (spec->task != nullptr && task != spec->task) {
        throw CLI::ValidationError(setting.origin, "applies to " + FlagName(spec->task) + " only");
      }
    }
    for (const char* key : {"model", "out"}) {
      if (Get(key) == nullptr || Get(key)->text.empty()) {
        throw CLI::ValidationError(FlagName(key),
                                   std::string("required (or ") + key + ": in the job file)");
      }
    }
    if (task.empty()) {
      throw CLI::ValidationError("task",
                                 "choose one: --composition FORMULA, --de-novo, "
                                 "--vary FILE or --constrain FILE");
    }
    request_.Add("model_path", JsonQuote(Get("model")->text));
    From("model_path", *Get("model"));
    plan_.description = "sample: model " + Get("model")->text;
    if (task == "composition") AddComposition();
    if (task == "de_novo") AddDeNovo();
    if (task == "vary") AddVariation();
    if (task == "constrain") AddConstrained();
    AddConditions();
    AddSampler();
    AddCounts();
    if (const Setting* s = Get("symprec")) {
      request_.Add("symprec", JsonNumber(RealNumber(*s)));
      From("symprec", *s);
    }
    const auto on = [&](const char* key) { return Get(key) != nullptr && Switch(*Get(key)); };
    plan_.output.symmetrise = on("symmetrise");
    if (plan_.output.symmetrise) request_.Add("symmetrise", "true");
    plan_.output.out_dir = Get("out")->text;
    plan_.output.multi_cif = on("multi_cif");
    plan_.output.force = on("force");
    plan_.output.json = on("json");
    if (const Setting* s = Get("log")) plan_.output.log_path = s->text;
    plan_.request_json = request_.Text();
    return plan_;
  }

 private:
  void AddComposition() {
    const Setting& formula = *Get("composition");
    JsonObject t;
    t.Add("formula", JsonQuote(formula.text));
    From("composition.formula", formula);
    plan_.description += ", composition " + formula.text;
    if (const Setting* s = Get("formula_units")) {
      const auto [low, high] = Range(*s);
      t.Add("min_formula_units", std::to_string(low));
      t.Add("max_formula_units", std::to_string(high));
      From("composition.min_formula_units", *s);
      From("composition.max_formula_units", *s);
      plan_.description += " x " + s->text;
    }
    request_.Add("composition", t.Text());
  }

  void AddDeNovo() {
    JsonObject t;
    plan_.description += ", de novo";
    if (const Setting* s = Get("elements")) {
      std::vector<long long> numbers;
      for (const std::string& symbol : Items(*s))
        numbers.push_back(AtomicNumber(symbol, s->origin));
      t.Add("allowed_elements", JsonArray(numbers));
      From("de_novo.allowed_elements", *s);
      plan_.description += " from " + s->text;
    }
    if (const Setting* s = Get("atoms")) {
      const auto [low, high] = Range(*s);
      t.Add("min_atoms", std::to_string(low));
      t.Add("max_atoms", std::to_string(high));
      From("de_novo.min_atoms", *s);
      From("de_novo.max_atoms", *s);
      plan_.description += ", atoms " + s->text;
    }
    request_.Add("de_novo", t.Text());
  }

  void AddVariation() {
    const Setting& file = *Get("vary");
    JsonObject t;
    t.Add("structure", StructureInput(file));
    From("variation.structure", file);
    plan_.description += ", variations of " + file.text;
    if (const Setting* s = Get("strength")) {
      t.Add("strength", JsonNumber(RealNumber(*s)));
      From("variation.strength", *s);
    }
    if (const Setting* s = Get("vary_species"); s != nullptr && Switch(*s)) {
      t.Add("vary_species", "true");
      From("variation.vary_species", *s);
    }
    request_.Add("variation", t.Text());
  }

  void AddConstrained() {
    const Setting& file = *Get("constrain");
    JsonObject t;
    const std::string input = StructureInput(file);
    t.Add("structure", input);
    From("constrained.structure", file);
    plan_.description += ", around " + file.text;
    if (const Setting* s = Get("fix_atoms")) {
      std::vector<long long> indices;
      if (s->text == "all") {
        for (long long i = 0, n = AtomCount(input, file); i < n; ++i) indices.push_back(i);
      } else {
        for (const std::string& item : Items(*s)) {
          indices.push_back(WholeNumber({item, s->origin}, kInt32Min, kInt32Max));
        }
      }
      t.Add("fixed_atoms", JsonArray(indices));
      From("constrained.fixed_atoms", *s);
    }
    if (const Setting* s = Get("fix_lattice"); s != nullptr && Switch(*s)) {
      t.Add("fix_lattice", "true");
      From("constrained.fix_lattice", *s);
    }
    if (const Setting* s = Get("add")) {
      std::vector<long long> numbers;
      for (const std::string& item : Items(*s)) {
        numbers.push_back(item == "?" ? 0 : AtomicNumber(item, s->origin));
      }
      t.Add("added_atoms", JsonArray(numbers));
      From("constrained.added_atoms", *s);
      plan_.description += " adding " + s->text;
    }
    request_.Add("constrained", t.Text());
  }

  void AddConditions() {
    JsonObject c;
    if (const Setting* s = Get("crystal_system")) {
      c.Add("crystal_system", std::to_string(CrystalSystem(*s)));
      From("conditions.crystal_system", *s);
    }
    if (const Setting* s = Get("space_group")) {
      c.Add("space_group", std::to_string(WholeNumber(*s, kInt32Min, kInt32Max)));
      From("conditions.space_group", *s);
    }
    if (!settings_.properties.empty()) {
      JsonObject properties;
      for (const auto& [name, value] : settings_.properties) {
        properties.Add(name, JsonNumber(RealNumber(value)));
        From("conditions.properties." + name, value);
      }
      c.Add("properties", properties.Text());
    }
    if (const Setting* s = Get("guidance")) {
      c.Add("guidance", JsonNumber(RealNumber(*s)));
      From("conditions.guidance", *s);
    }
    if (!c.Empty()) request_.Add("conditions", c.Text());
  }

  void AddSampler() {
    JsonObject m;
    if (const Setting* s = Get("sampler")) {
      m.Add("kind", Choice(*s, {{"ddpm", "SAMPLER_KIND_DDPM"},
                                {"ddim", "SAMPLER_KIND_DDIM"},
                                {"pc", "SAMPLER_KIND_PREDICTOR_CORRECTOR"},
                                {"ode", "SAMPLER_KIND_PROBABILITY_FLOW"}}));
      From("sampler.kind", *s);
      plan_.description += ", sampler " + s->text;
    }
    if (const Setting* s = Get("steps")) {
      m.Add("steps", std::to_string(WholeNumber(*s, std::numeric_limits<long long>::min(),
                                                std::numeric_limits<long long>::max())));
      From("sampler.steps", *s);
      plan_.description += ", " + s->text + " steps";
    }
    if (const Setting* s = Get("ddpm_variance")) {
      m.Add("ddpm_variance", Choice(*s, {{"posterior", "DDPM_VARIANCE_POSTERIOR"},
                                         {"forward", "DDPM_VARIANCE_FORWARD"}}));
      From("sampler.ddpm_variance", *s);
    }
    if (const Setting* s = Get("eta")) {
      m.Add("eta", JsonNumber(RealNumber(*s)));
      From("sampler.eta", *s);
    }
    if (const Setting* s = Get("corrector_steps")) {
      m.Add("corrector_steps", std::to_string(WholeNumber(*s, kInt32Min, kInt32Max)));
      From("sampler.corrector_steps", *s);
    }
    if (const Setting* s = Get("snr")) {
      m.Add("snr", JsonNumber(RealNumber(*s)));
      From("sampler.snr", *s);
    }
    if (!m.Empty()) request_.Add("sampler", m.Text());
  }

  void AddCounts() {
    plan_.count = kDefaultSampleCount;
    if (const Setting* s = Get("count")) {
      plan_.count = static_cast<std::uint32_t>(WholeNumber(*s, 1, kUint32Max));
      From("count", *s);
    }
    request_.Add("count", std::to_string(plan_.count));
    if (const Setting* s = Get("seed")) {
      request_.Add("seed", std::to_string(WholeNumber(*s, 0, kUint32Max)));
      From("seed", *s);
      plan_.description += ", seed " + s->text;
    }
    if (const Setting* s = Get("first_index")) {
      plan_.first_index = static_cast<std::uint32_t>(WholeNumber(*s, 0, kUint32Max));
      request_.Add("first_index", std::to_string(plan_.first_index));
      From("first_index", *s);
    }
    if (const Setting* s = Get("threads")) {
      request_.Add("threads", std::to_string(WholeNumber(*s, kInt32Min, kInt32Max)));
      From("threads", *s);
    }
    plan_.description +=
        ", candidates " + std::to_string(plan_.first_index) + ".." +
        std::to_string(static_cast<long long>(plan_.first_index) + plan_.count - 1);
  }

  const SampleSettings& settings_;
  JsonObject request_;
  SamplePlan plan_;
};

}  // namespace

std::string SamplePlan::FieldOrigin(const std::string& library_message) const {
  // The library's message is "STATUS_NAME: Method: field: what"; each part before a ": " is
  // tried as a field path, and the longest recorded field that is it or contains it ("x[2]",
  // "x.y") names the origin.
  std::size_t start = 0;
  for (std::size_t end; (end = library_message.find(": ", start)) != std::string::npos;
       start = end + 2) {
    const std::string field = library_message.substr(start, end - start);
    std::string best_field, best_origin;
    for (const auto& [recorded, origin] : origins) {
      const bool contains =
          field == recorded ||
          (field.size() > recorded.size() && field.compare(0, recorded.size(), recorded) == 0 &&
           (field[recorded.size()] == '[' || field[recorded.size()] == '.'));
      if (contains && recorded.size() > best_field.size()) {
        best_field = recorded;
        best_origin = origin;
      }
    }
    if (!best_origin.empty()) return best_origin;
  }
  return "";
}

SamplePlan PlanSample(const SampleSettings& settings) { return RequestBuilder(settings).Build(); }

}  // namespace nucleate::cli
