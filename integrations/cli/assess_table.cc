#include "assess_table.h"

#include <cmath>
#include <cstdio>
#include <limits>

#include "json_reply.h"

namespace nucleate::cli {
namespace {

std::string Format(const char* format, double value) {
  char text[64];
  std::snprintf(text, sizeof text, format, value);
  return text;
}

long long Count(const YAML::Node& node) {
  return node ? static_cast<long long>(AsDouble(node)) : 0;
}

double Real(const YAML::Node& node) {
  return node ? AsDouble(node) : std::numeric_limits<double>::quiet_NaN();
}

std::string Percent(const YAML::Node& fraction) {
  const double value = Real(fraction["value"]);
  return std::isnan(value) ? "n/a" : Format("%.1f%%", 100.0 * value);
}

std::string Number(double value) { return std::isnan(value) ? "n/a" : Format("%.4f", value); }

// "7 of 8 compositions".
std::string OfTotal(const YAML::Node& fraction, const std::string& unit) {
  return std::to_string(Count(fraction["count"])) + " of " +
         std::to_string(Count(fraction["total"])) + " " + unit;
}

class Table {
 public:
  void Row(const std::string& metric, const std::string& value, const std::string& size) {
    char line[256];
    std::snprintf(line, sizeof line, "%-48s %9s   %s\n", metric.c_str(), value.c_str(),
                  size.c_str());
    text_ += line;
  }
  const std::string& Text() const { return text_; }

 private:
  std::string text_;
};

// The figures of one set of candidates (structure prediction or de novo).
void CandidateRows(const YAML::Node& f, const std::string& prefix, const std::string& reference,
                   Table* table) {
  const YAML::Node valid = f["valid"];
  table->Row(prefix + "validity (min distance >= 0.5 A)", Percent(valid),
             OfTotal(valid, "finished candidates"));
  const YAML::Node neutral = f["charge_neutral"];
  table->Row(prefix + "charge neutrality", Percent(neutral),
             OfTotal(neutral, "candidates") + " (" +
                 std::to_string(Count(f["charge_not_applicable"])) + " not applicable)");
  table->Row(prefix + "space group above P-1 (symprec 0.1 A)", Percent(f["symmetric"]),
             OfTotal(f["symmetric"], "candidates"));
  table->Row(prefix + "uniqueness", Percent(f["unique"]), OfTotal(f["unique"], "candidates"));
  table->Row(prefix + "novelty against the training set", Percent(f["novel"]),
             OfTotal(f["novel"], "candidates"));
  const auto distance = [&](const char* key, const std::string& name) {
    const YAML::Node d = f[key];
    table->Row(prefix + name, Number(Real(d["value"])),
               std::to_string(Count(d["candidates"])) + " candidates vs " +
                   std::to_string(Count(d["reference"])) + " " + reference);
  };
  distance("density", "density distance (W1, g/cm3)");
  distance("element_count", "element-count distance (W1, elements)");
  if (Count(f["failed"]) > 0) {
    table->Row(prefix + "failed chains", std::to_string(Count(f["failed"])),
               "of " + std::to_string(Count(f["finished"])) + " finished");
  }
}

}  // namespace

std::string AssessTable(const std::string& reply_json) {
  const YAML::Node r = ParseJson(reply_json);
  std::string out = r["caution"].as<std::string>("") + "\n\n";
  const long long k = Count(r["candidates_per_composition"]);
  out += "held out: " + std::to_string(Count(r["held_out_structures"])) + " structures in " +
         std::to_string(Count(r["held_out_compositions"])) +
         " compositions; training: " + std::to_string(Count(r["training_structures"])) +
         " structures";
  const std::string hash = r["dataset_hash"].as<std::string>("");
  if (!hash.empty()) out += "; dataset hash " + hash.substr(0, 12) + "... verified";
  out += "\n\n";

  const YAML::Node rows = r["compositions"];
  if (rows && rows.size() > 0) {
    char line[256];
    std::snprintf(line, sizeof line, "%-16s %4s %6s  %-9s %-6s %9s  %s\n", "composition", "Z",
                  "atoms", "matches", "first", "best rms", "target");
    out += line;
    for (const YAML::Node& row : rows) {
      const std::string matches =
          std::to_string(Count(row["matches"])) + "/" + std::to_string(Count(row["finished"]));
      std::snprintf(
          line, sizeof line, "%-16s %4lld %6lld  %-9s %-6s %9s  %s\n",
          row["formula"].as<std::string>("").c_str(), Count(row["formula_units"]),
          Count(row["atoms"]), matches.c_str(), row["matched_first"].as<bool>(false) ? "yes" : "no",
          Number(Real(row["best_rms"])).c_str(), row["target"].as<std::string>("").c_str());
      out += line;
    }
  }
  for (const YAML::Node& skipped : r["skipped"]) {
    out += "skipped " + skipped["formula"].as<std::string>("") + ": " +
           skipped["reason"].as<std::string>("") + "\n";
  }

  Table table;
  table.Row("metric", "value", "sample size");
  const std::string with_k = std::to_string(k) + (k == 1 ? " candidate" : " candidates");
  table.Row("match rate, 1 candidate", Percent(r["matched_first"]),
            OfTotal(r["matched_first"], "compositions"));
  table.Row("match rate, " + with_k, Percent(r["matched_any"]),
            OfTotal(r["matched_any"], "compositions"));
  table.Row("rms of first-candidate matches", Number(Real(r["first_rms"]["value"])),
            std::to_string(Count(r["first_rms"]["sample_size"])) + " compositions");
  table.Row("rms of the best match, " + with_k, Number(Real(r["best_rms"]["value"])),
            std::to_string(Count(r["best_rms"]["sample_size"])) + " compositions");
  CandidateRows(r["prediction"], "", "target cells", &table);
  if (r["de_novo_run"].as<bool>(false)) {
    CandidateRows(r["de_novo"], "de novo: ", "held-out cells", &table);
  }
  out += "\n" + table.Text();
  out += "rms: matcher displacement in units of (V/N)^(1/3); W1: Wasserstein-1 distance\n";
  const YAML::Node notes = r["notes"];
  if (notes && notes.size() > 0) {
    out += "\nnotes:\n";
    for (const YAML::Node& note : notes) out += "  " + note.as<std::string>("") + "\n";
  }
  return out;
}

}  // namespace nucleate::cli
