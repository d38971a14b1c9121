#include "core/assess/composition_targets.h"

#include <map>
#include <numeric>

#include "core/common/error.h"
#include "core/elements/elements.h"
#include "core/structure/composition.h"

namespace nucleate::assess {
namespace {

// Empty when the model can sample the cell; otherwise why not.
std::string Unsampleable(const structure::Crystal& cell, const std::map<int, long long>& counts,
                         const model::Architecture& architecture, int max_atoms) {
  std::string unknown;
  for (const auto& [number, count] : counts) {
    if (architecture.token_of(number) >= 0) continue;
    unknown += (unknown.empty() ? "" : ", ") + std::string(elements::FindElement(number)->symbol);
  }
  if (!unknown.empty()) return "elements the model does not know: " + unknown;
  if (static_cast<long long>(cell.size()) > max_atoms) {
    return std::to_string(cell.size()) + " atoms, above limits.max_atoms (" +
           std::to_string(max_atoms) + ")";
  }
  return "";
}

}  // namespace

CompositionChoice ChooseCompositions(const std::vector<structure::Crystal>& held_out,
                                     const model::Architecture& architecture, int limit,
                                     int max_atoms) {
  // Reduced formula -> the first held-out cell of it (input order).
  std::map<std::string, std::size_t> first_of;
  for (std::size_t k = 0; k < held_out.size(); ++k) {
    std::string formula;
    try {
      formula = structure::ReducedHillFormula(held_out[k].numbers);
    } catch (const Error& e) {
      throw e.WithinField("held_out[" + std::to_string(k) + "]");
    }
    first_of.emplace(formula, k);
  }
  CompositionChoice choice;
  choice.compositions = static_cast<std::int64_t>(first_of.size());
  for (const auto& [formula, index] : first_of) {  // std::map: byte order of the formulas
    if (static_cast<int>(choice.assessed.size()) >= limit) break;
    const structure::Crystal& cell = held_out[index];
    const std::map<int, long long> counts = structure::CountElements(cell.numbers);
    const std::string reason = Unsampleable(cell, counts, architecture, max_atoms);
    if (!reason.empty()) {
      choice.skipped.push_back({formula, reason});
      continue;
    }
    long long units = 0;
    for (const auto& entry : counts) units = std::gcd(units, entry.second);
    CompositionTarget target;
    target.formula = formula;
    target.formula_units = static_cast<int>(units);
    target.target = index;
    for (const auto& [number, count] : counts) {
      target.reduced.emplace_back(number, static_cast<int>(count / units));
    }
    choice.assessed.push_back(std::move(target));
  }
  return choice;
}

}  // namespace nucleate::assess
