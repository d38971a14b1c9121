#include "core/assess/candidate_checks.h"

#include "core/common/error.h"
#include "core/common/parallel_for.h"
#include "core/structure/composition.h"
#include "core/structure/density.h"
#include "core/structure/periodic_distances.h"
#include "core/symmetry/symmetry.h"

namespace nucleate::assess {

std::vector<CandidateCheck> CheckCandidates(const std::vector<structure::Crystal>& crystals,
                                            double min_distance, double symprec, int threads) {
  std::vector<CandidateCheck> out(crystals.size());
  ParallelFor(crystals.size(), threads, [&](std::size_t k) {
    const structure::Crystal& c = crystals[k];
    CandidateCheck& check = out[k];
    try {
      check.valid = structure::MinimumInteratomicDistance(c).distance >= min_distance;
    } catch (const Error&) {
      check.valid = false;  // a cell the distance search refuses (degenerate, too long) is invalid
    }
    try {
      check.charge = checks::AssignOxidationStates(c.numbers).status;
    } catch (const Error&) {
      check.charge = checks::ChargeStatus::kUndetermined;
    }
    try {
      check.space_group = symmetry::AnalyseSymmetry(c, symprec).number;
    } catch (const Error&) {
      check.space_group = 0;  // no space group at this tolerance, or a cell spglib cannot take
    }
    try {
      check.density = structure::Density(c);
    } catch (const Error&) {
      check.density.reset();
    }
    try {
      check.element_count = static_cast<int>(structure::CountElements(c.numbers).size());
    } catch (const Error&) {
      check.element_count = 0;
    }
  });
  return out;
}

DistributionSamples SamplesOf(const std::vector<structure::Crystal>& crystals) {
  DistributionSamples out;
  for (const structure::Crystal& c : crystals) {
    try {
      out.density.push_back(structure::Density(c));
    } catch (const Error&) {
    }
    try {
      out.element_count.push_back(static_cast<double>(structure::CountElements(c.numbers).size()));
    } catch (const Error&) {
    }
  }
  return out;
}

DistributionSamples SamplesOf(const std::vector<CandidateCheck>& checks) {
  DistributionSamples out;
  for (const CandidateCheck& c : checks) {
    if (c.density) out.density.push_back(*c.density);
    if (c.element_count > 0) out.element_count.push_back(c.element_count);
  }
  return out;
}

void TallyChecks(const std::vector<sample::SampleOutcome>& outcomes,
                 const std::vector<CandidateCheck>& produced, CandidateFigures* f) {
  f->finished += static_cast<std::int64_t>(outcomes.size());
  for (const sample::SampleOutcome& o : outcomes) f->failed += o.error ? 1 : 0;
  f->valid.total += static_cast<std::int64_t>(outcomes.size());
  for (const CandidateCheck& c : produced) {
    f->valid.count += c.valid ? 1 : 0;
    if (c.charge == checks::ChargeStatus::kNotApplicable) {
      ++f->charge_not_applicable;
    } else {
      ++f->charge_neutral.total;
      f->charge_neutral.count += c.charge == checks::ChargeStatus::kNeutral ? 1 : 0;
    }
    ++f->symmetric.total;
    f->symmetric.count += c.space_group > 2 ? 1 : 0;
  }
}

}  // namespace nucleate::assess
