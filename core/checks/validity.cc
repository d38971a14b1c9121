#include "core/checks/validity.h"

#include <algorithm>
#include <cmath>
#include <limits>
#include <set>
#include <sstream>
#include <string>

#include "core/common/error.h"
#include "core/elements/elements.h"
#include "core/structure/density.h"
#include "core/structure/lattice.h"
#include "core/structure/neighbor_list.h"
#include "core/structure/validate.h"

namespace nucleate::checks {
namespace {

using structure::Crystal;

std::string Num(double x) {
  std::ostringstream out;
  out.precision(4);
  out << x;
  return out.str();
}

const char* Symbol(int z) { return elements::FindElement(z)->symbol; }

std::string Site(const Crystal& crystal, std::size_t k) {
  return "site " + std::to_string(k) + " (" + Symbol(crystal.numbers[k]) + ")";
}

std::string SignedState(int state) { return (state > 0 ? "+" : "") + std::to_string(state); }

void RequireThreshold(bool ok, const char* field, const std::string& message) {
  if (!ok) throw InvalidArgument(field, message);
}

void CheckCell(const Crystal& crystal, const ValidityThresholds& t, ValidityResult& r) {
  const structure::LatticeParameters p = structure::ParametersFromMatrix(crystal.lattice);
  const std::pair<const char*, double> angles[3] = {{"alpha", p.alpha}, {"beta", p.beta}, {"gamma", p.gamma}};
  for (const auto& [name, angle] : angles) {
    if (angle < t.min_angle || angle > t.max_angle) {
      r.problems.push_back({ProblemCode::kLatticeAngle,
                            std::string("lattice_angle: ") + name + " " + Num(angle) +
                                " degrees outside " + Num(t.min_angle) + ".." + Num(t.max_angle)});
    }
  }
  const double longest = std::max({p.a, p.b, p.c}), shortest = std::min({p.a, p.b, p.c});
  if (longest / shortest > t.max_axis_ratio) {
    r.problems.push_back({ProblemCode::kAxisRatio, "axis_ratio: longest/shortest cell vector " +
                                                       Num(longest / shortest) + " above " +
                                                       Num(t.max_axis_ratio)});
  }
  if (r.volume_per_atom < t.min_volume_per_atom || r.volume_per_atom > t.max_volume_per_atom) {
    r.problems.push_back({ProblemCode::kVolumePerAtom,
                          "volume_per_atom: " + Num(r.volume_per_atom) + " A^3 outside " +
                              Num(t.min_volume_per_atom) + ".." + Num(t.max_volume_per_atom)});
  }
}

void CheckDistances(const Crystal& crystal, const ValidityThresholds& t,
                    const structure::StructureLimits& limits, ValidityResult& r) {
  const structure::ClosestPair& c = r.min_distance;
  if (c.distance < t.min_distance) {
    const std::string where = c.i == c.j ? Site(crystal, c.i) + " and its own periodic image"
                                         : Site(crystal, c.i) + " and " + Site(crystal, c.j);
    r.problems.push_back({ProblemCode::kMinDistance, "min_distance: " + Num(c.distance) +
                                                         " A between " + where + " below " +
                                                         Num(t.min_distance) + " A"});
  }
  if (t.min_covalent_fraction <= 0) return;
  std::vector<double> radius(crystal.size());
  double largest = 0;
  for (std::size_t k = 0; k < crystal.size(); ++k) {
    radius[k] = elements::FindElement(crystal.numbers[k])->covalent_radius;
    if (std::isfinite(radius[k])) largest = std::max(largest, radius[k]);
  }
  if (largest == 0) return;
  // The worst contact: smallest distance / (r_i + r_j) below the fraction.
  double worst = t.min_covalent_fraction;
  structure::Neighbor worst_pair;
  bool found = false;
  structure::VisitNeighbors(crystal, t.min_covalent_fraction * 2 * largest,
                            [&](const structure::Neighbor& nb) {
                              if (nb.j < nb.i) return;
                              const double sum = radius[nb.i] + radius[nb.j];
                              if (!std::isfinite(sum)) return;
                              const double ratio = nb.distance / sum;
                              if (ratio < worst) {
                                worst = ratio;
                                worst_pair = nb;
                                found = true;
                              }
                            },
                            limits);
  if (found) {
    const std::string where = worst_pair.i == worst_pair.j
                                  ? Site(crystal, worst_pair.i) + " and its own periodic image"
                                  : Site(crystal, worst_pair.i) + " and " + Site(crystal, worst_pair.j);
    r.problems.push_back({ProblemCode::kCovalentOverlap,
                          "covalent_overlap: " + Num(worst_pair.distance) + " A between " + where +
                              " is " + Num(worst) + " of the covalent radii sum, below " +
                              Num(t.min_covalent_fraction)});
  }
}

void CheckCharges(const Crystal& crystal, const ValidityThresholds& t, ValidityResult& r) {
  if (!t.check_charge_neutrality) return;
  r.charge = AssignOxidationStates(crystal.numbers, t.charge_search);
  if (r.charge.status == ChargeStatus::kNotNeutral) {
    r.problems.push_back({ProblemCode::kChargeNeutrality, "charge_neutrality: " + r.charge.reason});
  }
  if (t.check_electronegativity_order && r.charge.status == ChargeStatus::kNeutral &&
      !r.charge.electronegativity_order_ok) {
    const int cation = r.charge.most_electronegative_cation;
    const int anion = r.charge.least_electronegative_anion;
    int cation_state = 0, anion_state = 0;
    for (const ElementState& s : r.charge.states) {
      if (s.number == cation) cation_state = s.state;
      if (s.number == anion) anion_state = s.state;
    }
    r.problems.push_back(
        {ProblemCode::kElectronegativityOrder,
         std::string("electronegativity_order: cation ") + Symbol(cation) + SignedState(cation_state) +
             " (Pauling " + Num(elements::FindElement(cation)->electronegativity) +
             ") is more electronegative than anion " + Symbol(anion) + SignedState(anion_state) +
             " (Pauling " + Num(elements::FindElement(anion)->electronegativity) +
             ") in the neutral assignment of common oxidation states found"});
  }
}

}  // namespace

const char* ProblemCodeName(ProblemCode code) {
  switch (code) {
    case ProblemCode::kInvalidStructure: return "invalid_structure";
    case ProblemCode::kNonFinite: return "non_finite";
    case ProblemCode::kMinDistance: return "min_distance";
    case ProblemCode::kCovalentOverlap: return "covalent_overlap";
    case ProblemCode::kVolumePerAtom: return "volume_per_atom";
    case ProblemCode::kLatticeAngle: return "lattice_angle";
    case ProblemCode::kAxisRatio: return "axis_ratio";
    case ProblemCode::kChargeNeutrality: return "charge_neutrality";
    case ProblemCode::kElectronegativityOrder: return "electronegativity_order";
  }
  return "unknown";
}

void ValidateThresholds(const ValidityThresholds& t) {
  auto non_negative = [](double x) { return std::isfinite(x) && x >= 0; };
  RequireThreshold(non_negative(t.min_distance), "min_distance", "must be finite and >= 0");
  RequireThreshold(non_negative(t.min_covalent_fraction), "min_covalent_fraction",
                   "must be finite and >= 0");
  RequireThreshold(non_negative(t.min_volume_per_atom), "min_volume_per_atom", "must be finite and >= 0");
  RequireThreshold(!std::isnan(t.max_volume_per_atom) && t.max_volume_per_atom >= t.min_volume_per_atom,
                   "max_volume_per_atom", "must be >= min_volume_per_atom");
  RequireThreshold(std::isfinite(t.min_angle) && t.min_angle >= 0 && t.min_angle < 180, "min_angle",
                   "must lie in 0..180 degrees");
  RequireThreshold(std::isfinite(t.max_angle) && t.max_angle > t.min_angle && t.max_angle <= 180,
                   "max_angle", "must lie above min_angle and at most 180 degrees");
  RequireThreshold(!std::isnan(t.max_axis_ratio) && t.max_axis_ratio >= 1, "max_axis_ratio",
                   "must be >= 1");
  RequireThreshold(t.charge_search.max_combinations >= 1, "charge_search.max_combinations",
                   "must be >= 1");
  RequireThreshold(t.charge_search.max_sites_mixed_valence >= 0,
                   "charge_search.max_sites_mixed_valence", "must be >= 0");
}

ValidityResult CheckValidity(const Crystal& crystal, const ValidityThresholds& thresholds,
                             const structure::StructureLimits& limits) {
  ValidateThresholds(thresholds);
  ValidityResult r;
  r.min_distance.distance = std::numeric_limits<double>::quiet_NaN();
  r.volume_per_atom = r.density = std::numeric_limits<double>::quiet_NaN();
  if (auto defect = structure::FindCrystalDefect(crystal, limits)) {
    // A structure larger than the caller allowed is refused, not reported.
    if (defect->error.kind() == ErrorKind::kLimitExceeded) throw defect->error;
    r.problems.push_back({defect->non_finite ? ProblemCode::kNonFinite : ProblemCode::kInvalidStructure,
                          std::string(defect->non_finite ? "non_finite: " : "invalid_structure: ") +
                              defect->error.what()});
    return r;
  }
  // Flags first: they hold whatever else is wrong.
  std::set<int> present(crystal.numbers.begin(), crystal.numbers.end());
  for (int z : present) {
    const elements::Element* e = elements::FindElement(z);
    if (e->toxic) r.toxic_elements.push_back(z);
    if (e->radioactive) r.radioactive_elements.push_back(z);
  }
  r.volume_per_atom = std::fabs(crystal.lattice.determinant()) / static_cast<double>(crystal.size());
  r.density = structure::Density(crystal, limits);
  r.min_distance = structure::MinimumInteratomicDistance(crystal, limits);
  CheckDistances(crystal, thresholds, limits, r);
  CheckCell(crystal, thresholds, r);
  CheckCharges(crystal, thresholds, r);
  r.valid = r.problems.empty();
  return r;
}

}  // namespace nucleate::checks
