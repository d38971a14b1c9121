#include "methods/structure_report.h"

#include <algorithm>
#include <cmath>

#include "core/elements/elements.h"
#include "core/structure/composition.h"
#include "core/symmetry/symmetry.h"

namespace nucleate::capi {

checks::ValidityThresholds ThresholdsFromMessage(const v1::ValidityThresholds& m) {
  checks::ValidityThresholds t;  // core's defaults are the only defaults
  if (m.has_min_distance()) t.min_distance = m.min_distance();
  if (m.has_min_covalent_fraction()) t.min_covalent_fraction = m.min_covalent_fraction();
  if (m.has_min_volume_per_atom()) t.min_volume_per_atom = m.min_volume_per_atom();
  if (m.has_max_volume_per_atom()) t.max_volume_per_atom = m.max_volume_per_atom();
  if (m.has_min_angle()) t.min_angle = m.min_angle();
  if (m.has_max_angle()) t.max_angle = m.max_angle();
  if (m.has_max_axis_ratio()) t.max_axis_ratio = m.max_axis_ratio();
  if (m.has_check_charge_neutrality()) t.check_charge_neutrality = m.check_charge_neutrality();
  if (m.has_check_electronegativity_order()) {
    t.check_electronegativity_order = m.check_electronegativity_order();
  }
  return t;
}

namespace {

const char* Symbol(int number) { return elements::FindElement(number)->symbol; }

void FillValidity(const checks::ValidityResult& v, v1::StructureReport* report) {
  report->set_valid(v.valid);
  report->set_min_distance(v.min_distance.distance);
  report->set_density(v.density);
  report->set_volume_per_atom(v.volume_per_atom);
  for (const checks::Problem& problem : v.problems) {
    v1::Problem* out = report->add_problems();
    out->set_code(checks::ProblemCodeName(problem.code));
    out->set_message(problem.message);
  }
  for (int z : v.toxic_elements) report->add_toxic_elements(Symbol(z));
  for (int z : v.radioactive_elements) report->add_radioactive_elements(Symbol(z));
  report->set_charge_status(checks::ChargeStatusName(v.charge.status));
  for (const checks::ElementState& state : v.charge.states) {
    v1::OxidationState* out = report->add_oxidation_states();
    out->set_element(Symbol(state.number));
    out->set_state(state.state);
    out->set_count(state.count);
  }
}

// Symmetry is a finding, not a verdict: when spglib finds none at the tolerance (or refuses the
// structure, e.g. for overlapping atoms) the report says so in a warning and goes on.
void FillSymmetry(const structure::Crystal& crystal, double symprec, double angle_tolerance,
                  v1::StructureReport* report) {
  try {
    const symmetry::SymmetryInfo info = symmetry::AnalyseSymmetry(crystal, symprec, angle_tolerance);
    report->set_space_group_number(info.number);
    report->set_international_symbol(info.international);
    report->set_crystal_system(symmetry::CrystalSystemName(info.crystal_system));
  } catch (const Error& error) {
    report->add_warnings(std::string("symmetry: ") + error.what());
  }
}

}  // namespace

void CheckOne(const structure::Crystal& crystal, const checks::ValidityThresholds& thresholds,
              const InputLimits& limits, double symprec, double angle_tolerance,
              v1::StructureReport* report) {
  report->set_num_atoms(static_cast<int>(crystal.size()));
  const checks::ValidityResult validity = checks::CheckValidity(crystal, thresholds, limits.structure);
  FillValidity(validity, report);
  report->set_volume(std::abs(crystal.lattice.determinant()));
  const bool known_elements = std::none_of(
      validity.problems.begin(), validity.problems.end(), [](const checks::Problem& p) {
        return p.code == checks::ProblemCode::kInvalidStructure ||
               p.code == checks::ProblemCode::kNonFinite;
      });
  if (!known_elements) return;  // formulas and symmetry need a well-formed structure
  report->set_formula(structure::HillFormula(crystal.numbers));
  report->set_reduced_formula(structure::ReducedHillFormula(crystal.numbers));
  FillSymmetry(crystal, symprec, angle_tolerance, report);
}

}  // namespace nucleate::capi
