// The per-candidate measurements of an assessment, and their tally into CandidateFigures. Each
// measurement that cannot be made on a candidate (a cell spglib or the distance search refuses)
// counts as a failed check, never as an error of the call.
#pragma once

#include <optional>
#include <vector>

#include "core/assess/assessment.h"
#include "core/checks/charge_neutrality.h"
#include "core/sample/sampler.h"

namespace nucleate::assess {

struct CandidateCheck {
  bool valid = false;  // min distance (periodic images included) >= min_distance
  checks::ChargeStatus charge = checks::ChargeStatus::kUndetermined;
  int space_group = 0;            // 0 when none was found at symprec
  std::optional<double> density;  // g/cm3
  int element_count = 0;          // distinct elements
};

// One check per crystal, in order, on up to `threads` threads (spglib calls are serialised).
std::vector<CandidateCheck> CheckCandidates(const std::vector<structure::Crystal>& crystals,
                                            double min_distance, double symprec, int threads);

// The two distributions the Wasserstein distances compare, for a reference set: densities (g/cm3)
// and distinct elements per cell, each over the crystals where it could be computed.
struct DistributionSamples {
  std::vector<double> density;
  std::vector<double> element_count;
};
DistributionSamples SamplesOf(const std::vector<structure::Crystal>& crystals);
DistributionSamples SamplesOf(const std::vector<CandidateCheck>& checks);

// Adds to finished, failed, valid, charge_neutral, charge_not_applicable and
// symmetric from the outcomes (finished chains) and the checks of the produced ones (in outcome
// order, failed ones left out). Uniqueness, novelty and distances are the caller's.
void TallyChecks(const std::vector<sample::SampleOutcome>& outcomes,
                 const std::vector<CandidateCheck>& produced, CandidateFigures* figures);

}  // namespace nucleate::assess
