#include "core/checks/charge_neutrality.h"

#include <algorithm>
#include <array>
#include <cmath>
#include <cstdlib>
#include <limits>
#include <map>
#include <optional>
#include <string>
#include <utility>

#include "core/common/error.h"
#include "core/elements/elements.h"

namespace nucleate::checks {
namespace {

struct Species {
  int z = 0;
  int count = 0;
  const elements::Element* element = nullptr;
};

// The sums reachable by some atoms, each taking one of `allowed` states, on a dense range: sum
// lo + i at index i. Each reached sum keeps one representation, the first found when sums are
// extended in ascending order and states in the order of `allowed`: the counts per state.
struct Reachable {
  std::vector<int> allowed;
  long long lo = 0;
  std::vector<char> reached;
  std::vector<int> counts;  // allowed.size() per sum
  const int* CountsOf(long long sum) const {
    return counts.data() + static_cast<std::size_t>(sum - lo) * allowed.size();
  }
};

struct EnOrder {
  bool ok = true;
  int cation = 0, anion = 0;
};

// signs[s] is +1 (cation) or -1 (anion) for species s.
EnOrder ElectronegativityOrder(const std::vector<Species>& species, const std::vector<int>& signs) {
  EnOrder order;
  double max_cation = -std::numeric_limits<double>::infinity();
  double min_anion = std::numeric_limits<double>::infinity();
  for (std::size_t s = 0; s < species.size(); ++s) {
    const double en = species[s].element->electronegativity;
    if (!std::isfinite(en)) continue;
    if (signs[s] > 0 && en > max_cation) {
      max_cation = en;
      order.cation = species[s].z;
    }
    if (signs[s] < 0 && en < min_anion) {
      min_anion = en;
      order.anion = species[s].z;
    }
  }
  order.ok = !(order.cation != 0 && order.anion != 0 && max_cation > min_anion);
  return order;
}

void Fill(const std::vector<Species>& species, const std::vector<std::map<int, int>>& per_species,
          const std::vector<int>& numbers, const EnOrder& order, ChargeAssignment& out) {
  out.status = ChargeStatus::kNeutral;
  out.reason.clear();
  out.electronegativity_order_ok = order.ok;
  out.most_electronegative_cation = order.cation;
  out.least_electronegative_anion = order.anion;
  out.states.clear();
  std::map<int, std::vector<int>> queue;  // z -> states to hand out, lowest first
  for (std::size_t s = 0; s < species.size(); ++s) {
    if (per_species[s].size() > 1) out.mixed_valence = true;
    for (const auto& [state, count] : per_species[s]) {
      out.states.push_back({species[s].z, state, count});
      for (int c = 0; c < count; ++c) queue[species[s].z].push_back(state);
    }
  }
  std::map<int, std::size_t> next;
  out.site_states.clear();
  for (int z : numbers) out.site_states.push_back(queue[z][next[z]++]);
}

// Every atom of a species shares one state.
bool SingleValencePass(const std::vector<Species>& species, const std::vector<int>& numbers,
                       const ChargeSearchBounds& bounds, ChargeAssignment& out) {
  double combinations = 1;
  for (const Species& sp : species) combinations *= static_cast<double>(sp.element->common_oxidation_states.size());
  if (combinations > static_cast<double>(bounds.max_combinations)) {
    out.status = ChargeStatus::kUndetermined;
    out.reason = std::to_string(static_cast<long long>(combinations)) +
                 " combinations of oxidation states, above the search bound of " +
                 std::to_string(bounds.max_combinations);
    return false;
  }
  std::vector<std::size_t> index(species.size(), 0);
  bool found = false;
  std::pair<int, long long> best_score{2, 0};
  std::vector<int> best_states;
  EnOrder best_order;
  std::vector<int> states(species.size()), signs(species.size());
  for (long long c = 0; c < static_cast<long long>(combinations); ++c) {
    long long sum = 0, magnitude = 0;
    for (std::size_t s = 0; s < species.size(); ++s) {
      states[s] = species[s].element->common_oxidation_states[index[s]];
      signs[s] = states[s] > 0 ? 1 : -1;
      sum += static_cast<long long>(species[s].count) * states[s];
      magnitude += static_cast<long long>(species[s].count) * std::abs(states[s]);
    }
    if (sum == 0) {
      const EnOrder order = ElectronegativityOrder(species, signs);
      const std::pair<int, long long> score{order.ok ? 0 : 1, magnitude};
      if (!found || score < best_score) {
        found = true;
        best_score = score;
        best_states = states;
        best_order = order;
      }
    }
    // Next combination, mixed radix.
    for (std::size_t s = 0; s < species.size(); ++s) {
      if (++index[s] < species[s].element->common_oxidation_states.size()) break;
      index[s] = 0;
    }
  }
  if (!found) return false;
  std::vector<std::map<int, int>> per_species(species.size());
  for (std::size_t s = 0; s < species.size(); ++s) per_species[s][best_states[s]] = species[s].count;
  Fill(species, per_species, numbers, best_order, out);
  return true;
}

// Sums reachable by `count` atoms each taking one of `allowed`, atom by atom. Dense arrays rather
// than ordered maps of vectors: this search ran for most random candidates and was half the time
// of their checks.
Reachable ReachableSums(int count, std::vector<int> allowed) {
  Reachable r;
  r.allowed = std::move(allowed);
  const std::size_t k = r.allowed.size();
  int low = r.allowed[0], high = r.allowed[0];
  for (int a : r.allowed) low = std::min(low, a), high = std::max(high, a);
  // Layer for `atoms` atoms: sums atoms*low .. atoms*high.
  r.lo = 0;
  r.reached.assign(1, 1);
  r.counts.assign(k, 0);
  Reachable next;
  for (int atom = 0; atom < count; ++atom) {
    next.lo = r.lo + low;
    const std::size_t width = r.reached.size() + static_cast<std::size_t>(high - low);
    next.reached.assign(width, 0);
    next.counts.assign(width * k, 0);
    for (std::size_t i = 0; i < r.reached.size(); ++i) {
      if (!r.reached[i]) continue;
      const long long sum = r.lo + static_cast<long long>(i);
      for (std::size_t a = 0; a < k; ++a) {
        const std::size_t j = static_cast<std::size_t>(sum + r.allowed[a] - next.lo);
        if (next.reached[j]) continue;
        next.reached[j] = 1;
        std::copy_n(r.counts.data() + i * k, k, next.counts.data() + j * k);
        ++next.counts[j * k + a];
      }
    }
    r.lo = next.lo;
    r.reached.swap(next.reached);
    r.counts.swap(next.counts);
  }
  return r;
}

// Atoms of a species may take different states of one sign.
bool MixedValencePass(const std::vector<Species>& species, const std::vector<int>& numbers,
                      const ChargeSearchBounds& bounds, ChargeAssignment& out) {
  if (static_cast<std::int64_t>(numbers.size()) > bounds.max_sites_mixed_valence) {
    out.status = ChargeStatus::kUndetermined;
    out.reason = "no assignment with one state per element; mixed valence is searched only up to " +
                 std::to_string(bounds.max_sites_mixed_valence) + " sites";
    return false;
  }
  // Sign options per species and the states of each sign.
  std::vector<std::vector<int>> sign_options(species.size());
  double patterns = 1;
  for (std::size_t s = 0; s < species.size(); ++s) {
    for (int sign : {1, -1}) {
      for (int state : species[s].element->common_oxidation_states) {
        if (state * sign > 0) {
          sign_options[s].push_back(sign);
          break;
        }
      }
    }
    patterns *= static_cast<double>(sign_options[s].size());
  }
  if (patterns > static_cast<double>(bounds.max_combinations)) {
    out.status = ChargeStatus::kUndetermined;
    out.reason = "too many cation/anion patterns for the mixed-valence search";
    return false;
  }
  std::vector<std::vector<int>> ordered;  // sign patterns, electronegativity order right first
  std::vector<std::vector<int>> wrong_order;
  std::vector<std::size_t> index(species.size(), 0);
  for (long long p = 0; p < static_cast<long long>(patterns); ++p) {
    std::vector<int> signs(species.size());
    for (std::size_t s = 0; s < species.size(); ++s) signs[s] = sign_options[s][index[s]];
    (ElectronegativityOrder(species, signs).ok ? ordered : wrong_order).push_back(signs);
    for (std::size_t s = 0; s < species.size(); ++s) {
      if (++index[s] < sign_options[s].size()) break;
      index[s] = 0;
    }
  }
  ordered.insert(ordered.end(), wrong_order.begin(), wrong_order.end());

  // Per species and sign (index 0: cations, 1: anions), the sums its atoms can reach.
  std::vector<std::array<std::optional<Reachable>, 2>> cache(species.size());
  // Totals reachable by the first s + 1 species, on a dense range from lo[s]; for each, the sum of
  // species s on the first way found to reach it (totals and species sums in ascending order),
  // from which the way back from a total of zero is read.
  std::vector<long long> lo(species.size());
  std::vector<std::vector<char>> reached(species.size());
  std::vector<std::vector<long long>> last_sum(species.size());
  std::vector<const Reachable*> per(species.size());
  for (const std::vector<int>& signs : ordered) {
    long long previous_lo = 0;
    std::vector<char> start{1};
    const std::vector<char>* previous = &start;
    for (std::size_t s = 0; s < species.size(); ++s) {
      std::optional<Reachable>& entry = cache[s][signs[s] > 0 ? 0 : 1];
      if (!entry) {
        std::vector<int> allowed;
        for (int state : species[s].element->common_oxidation_states) {
          if (state * signs[s] > 0) allowed.push_back(state);
        }
        entry = ReachableSums(species[s].count, std::move(allowed));
      }
      per[s] = &*entry;
      const Reachable& r = *per[s];
      lo[s] = previous_lo + r.lo;
      reached[s].assign(previous->size() + r.reached.size() - 1, 0);
      last_sum[s].resize(reached[s].size());
      for (std::size_t i = 0; i < previous->size(); ++i) {
        if (!(*previous)[i]) continue;
        for (std::size_t e = 0; e < r.reached.size(); ++e) {
          if (!r.reached[e] || reached[s][i + e]) continue;
          reached[s][i + e] = 1;
          last_sum[s][i + e] = r.lo + static_cast<long long>(e);
        }
      }
      previous_lo = lo[s];
      previous = &reached[s];
    }
    const std::size_t last = species.size() - 1;
    if (0 < lo[last] || -lo[last] >= static_cast<long long>(reached[last].size()) ||
        !reached[last][static_cast<std::size_t>(-lo[last])]) {
      continue;
    }
    std::vector<std::map<int, int>> per_species(species.size());
    long long total = 0;
    for (std::size_t s = species.size(); s-- > 0;) {
      const long long sum = last_sum[s][static_cast<std::size_t>(total - lo[s])];
      const int* counts = per[s]->CountsOf(sum);
      for (std::size_t a = 0; a < per[s]->allowed.size(); ++a) {
        if (counts[a] > 0) per_species[s][per[s]->allowed[a]] = counts[a];
      }
      total -= sum;
    }
    Fill(species, per_species, numbers, ElectronegativityOrder(species, signs), out);
    return true;
  }
  return false;
}

}  // namespace

const char* ChargeStatusName(ChargeStatus status) {
  switch (status) {
    case ChargeStatus::kNeutral: return "neutral";
    case ChargeStatus::kNotNeutral: return "not_neutral";
    case ChargeStatus::kUndetermined: return "undetermined";
    case ChargeStatus::kNotApplicable: return "not_applicable";
  }
  return "unknown";
}

ChargeAssignment AssignOxidationStates(const std::vector<int>& numbers,
                                       const ChargeSearchBounds& bounds) {
  std::map<int, int> composition;
  for (std::size_t k = 0; k < numbers.size(); ++k) {
    if (elements::FindElement(numbers[k]) == nullptr) {
      throw InvalidArgument("atomic_numbers[" + std::to_string(k) + "]",
                            "atomic number " + std::to_string(numbers[k]) + " is not in 1..118");
    }
    ++composition[numbers[k]];
  }
  std::vector<Species> species;
  for (const auto& [z, count] : composition) species.push_back({z, count, elements::FindElement(z)});

  ChargeAssignment out;
  if (species.empty()) {
    out.status = ChargeStatus::kNotApplicable;
    out.reason = "no sites";
    return out;
  }
  if (species.size() == 1) {
    out.status = ChargeStatus::kNotApplicable;
    out.reason = std::string("a single element (") + species[0].element->symbol + "): oxidation state 0";
    return out;
  }
  bool any_anion = false;
  for (const Species& sp : species) {
    for (int state : sp.element->common_oxidation_states) any_anion = any_anion || state < 0;
  }
  if (!any_anion) {
    out.status = ChargeStatus::kNotApplicable;
    out.reason = "no element has a negative common oxidation state (a metal or intermetallic)";
    return out;
  }
  for (const Species& sp : species) {
    if (sp.element->common_oxidation_states.empty()) {
      out.status = ChargeStatus::kNotNeutral;
      out.reason = std::string(sp.element->symbol) + " has no common oxidation state";
      return out;
    }
  }
  // The passes report kUndetermined themselves when they hit a bound.
  out.status = ChargeStatus::kNotNeutral;
  if (SingleValencePass(species, numbers, bounds, out)) return out;
  if (out.status == ChargeStatus::kUndetermined) return out;
  if (MixedValencePass(species, numbers, bounds, out)) return out;
  if (out.status == ChargeStatus::kUndetermined) return out;
  out.status = ChargeStatus::kNotNeutral;
  out.reason = "no assignment of common oxidation states sums to zero, mixed valence included";
  return out;
}

}  // namespace nucleate::checks
