#include "core/assess/assessment.h"

#include <algorithm>
#include <cmath>
#include <set>

#include "core/assess/candidate_checks.h"
#include "core/assess/composition_targets.h"
#include "core/assess/wasserstein.h"
#include "core/common/error.h"
#include "core/common/parallel_for.h"
#include "core/common/require.h"
#include "core/common/thread_count.h"
#include "core/match/dedup.h"
#include "core/match/structure_matcher.h"
#include "core/model/diffusion.h"
#include "core/sample/sampler.h"
#include "core/structure/composition.h"
#include "core/structure/density.h"

namespace nucleate::assess {
namespace {

// De novo candidates take sample indices from here up, structure-prediction candidates stay
// below (position x K < limits.max_count <= 2^31), so no two candidates of a call share random
// numbers, and neither set depends on the size of the other.
constexpr std::uint32_t kDeNovoFirstIndex = std::uint32_t{1} << 31;

}  // namespace

void ValidateAssessSettings(const AssessSettings& s) {
  if (s.compositions < 1) throw InvalidArgument("compositions", "must be >= 1");
  if (s.candidates_per_composition < 1) {
    throw InvalidArgument("candidates_per_composition", "must be >= 1");
  }
  if (s.de_novo_count < 0) throw InvalidArgument("de_novo_count", "must be >= 0 (0 = none)");
  ResolveThreadCount(s.threads);
  RequirePositiveFinite("min_distance", s.min_distance);
  RequirePositiveFinite("symprec", s.symprec);
  try {
    match::ValidateTolerances(s.tolerances);
  } catch (const Error& e) {
    throw e.WithinField("tolerances");
  }
  if (s.limits.max_count < 1) throw InvalidArgument("limits.max_count", "must be >= 1");
  if (s.limits.max_count > std::int64_t{kDeNovoFirstIndex}) {
    throw InvalidArgument("limits.max_count", "must be at most 2^31 for an assessment");
  }
  if (s.limits.max_atoms < 1) throw InvalidArgument("limits.max_atoms", "must be >= 1");
}

namespace {

// Reports one sampling job's progress as part of the whole call, in sample steps. Every job
// starts its chains at the top level, so all candidates take the same number of steps.
sample::SampleObserver JobObserver(const AssessObserver& observer, std::int64_t before,
                                   std::int64_t count, std::int64_t all) {
  if (!observer) return {};
  return [=](std::int64_t done, std::int64_t total) {
    const std::int64_t per_candidate = total / count;
    return observer(before * per_candidate + done, all * per_candidate);
  };
}

sample::SampleJob BaseJob(const AssessSettings& s, std::uint32_t first_index, int count) {
  sample::SampleJob job;
  job.sampler = s.sampler;
  job.seed = s.seed;
  job.first_index = first_index;
  job.count = static_cast<std::uint32_t>(count);
  job.threads = s.threads;
  job.limits = s.limits;
  return job;
}

std::vector<structure::Crystal> Produced(const sample::SampleRun& run) {
  std::vector<structure::Crystal> out;
  for (const sample::SampleOutcome& o : run.samples) {
    if (o.crystal) out.push_back(*o.crystal);
  }
  return out;
}

Distance DistanceBetween(const std::vector<double>& candidates,
                         const std::vector<double>& reference) {
  Distance d;
  d.candidates = static_cast<std::int64_t>(candidates.size());
  d.reference = static_cast<std::int64_t>(reference.size());
  if (!candidates.empty() && !reference.empty()) d.value = Wasserstein1(candidates, reference);
  return d;
}

// The matches of one composition's candidates against its target, and the row's figures.
void MatchComposition(const sample::SampleRun& run, std::uint32_t first_index,
                      const structure::Crystal& target, const match::MatchTolerances& tolerances,
                      int threads, CompositionRow* row) {
  const std::size_t n = run.samples.size();
  std::vector<match::MatchResult> results(n);
  ParallelFor(n, threads, [&](std::size_t k) {
    const sample::SampleOutcome& o = run.samples[k];
    if (!o.crystal) return;
    try {
      results[k] = match::MatchStructures(*o.crystal, target, tolerances);
    } catch (const Error&) {
      results[k] = match::MatchResult{};  // a cell the matcher cannot take matches nothing
    }
  });
  for (std::size_t k = 0; k < n; ++k) {
    const sample::SampleOutcome& o = run.samples[k];
    row->failed += o.error ? 1 : 0;
    if (!results[k].match) continue;
    ++row->matches;
    row->matched_any = true;
    if (std::isnan(row->best_rms) || results[k].rms < row->best_rms) row->best_rms = results[k].rms;
    if (o.index == first_index) {
      row->matched_first = true;
      row->first_rms = results[k].rms;
    }
  }
  row->finished = static_cast<int>(n);
}


Mean MeanOf(const std::vector<double>& values) {
  Mean m;
  m.sample_size = static_cast<std::int64_t>(values.size());
  if (values.empty()) return m;
  double sum = 0;
  for (double v : values) sum += v;
  m.value = sum / static_cast<double>(values.size());
  return m;
}

}  // namespace

Assessment Assess(const model::ModelBundle& bundle, const AssessData& data, const AssessSettings& s,
                  const AssessObserver& observer) {
  ValidateAssessSettings(s);
  const model::DiffusionProcess process(bundle.schedules, bundle.architecture);
  sample::ValidateSamplerSettings(s.sampler, process.steps());
  if (data.held_out.empty()) {
    throw InvalidArgument("held_out", "no held-out structures: nothing to assess the model on");
  }
  const CompositionChoice choice =
      ChooseCompositions(data.held_out, bundle.architecture, s.compositions, s.limits.max_atoms);
  const int k_candidates = s.candidates_per_composition;
  const int threads = ResolveThreadCount(s.threads);
  const bool generates_species = bundle.architecture.species_mode == model::SpeciesMode::kAbsorbing;
  const std::int64_t de_novo = generates_species ? s.de_novo_count : 0;
  const std::int64_t all =
      static_cast<std::int64_t>(choice.assessed.size()) * k_candidates + de_novo;
  if (all > s.limits.max_count) {
    throw LimitExceeded(
        "limits.max_count",
        std::to_string(all) + " candidates (" + std::to_string(choice.assessed.size()) +
            " compositions x " + std::to_string(k_candidates) + " + " + std::to_string(de_novo) +
            " de novo); the limit per call is " + std::to_string(s.limits.max_count));
  }

  Assessment a;
  a.held_out_structures = static_cast<std::int64_t>(data.held_out.size());
  a.held_out_compositions = choice.compositions;
  a.training_structures = static_cast<std::int64_t>(data.training.size());
  a.candidates_per_composition = k_candidates;
  a.skipped = choice.skipped;
  if (static_cast<int>(choice.assessed.size()) < s.compositions) {
    a.notes.push_back(
        std::to_string(choice.assessed.size()) + " of the " + std::to_string(s.compositions) +
        " compositions asked for could be assessed: " + std::to_string(choice.compositions) +
        " held-out compositions, " + std::to_string(choice.skipped.size()) + " skipped");
  }

  // Structure prediction: K candidates per composition, with the target's formula and Z.
  std::vector<structure::Crystal> prediction;  // produced candidates, composition by composition
  std::vector<CandidateCheck> prediction_checks;
  std::vector<structure::Crystal> targets;  // of the compositions assessed
  std::int64_t before = 0;
  for (std::size_t p = 0; p < choice.assessed.size(); ++p) {
    const CompositionTarget& t = choice.assessed[p];
    sample::SampleJob job = BaseJob(
        s, static_cast<std::uint32_t>(p * static_cast<std::size_t>(k_candidates)), k_candidates);
    job.task = sample::TaskKind::kComposition;
    job.composition.formula = t.reduced;
    job.composition.min_units = t.formula_units;
    job.composition.max_units = t.formula_units;
    const sample::SampleRun run =
        sample::RunSampling(bundle, job, JobObserver(observer, before, k_candidates, all));
    a.evaluations += run.evaluations;
    before += k_candidates;
    if (run.cancelled) {  // a composition with fewer than K candidates would skew the rates
      a.cancelled = true;
      break;
    }
    const structure::Crystal& target = data.held_out[t.target];
    CompositionRow row;
    row.formula = t.formula;
    row.formula_units = t.formula_units;
    row.atoms = static_cast<int>(target.size());
    row.target = target.label;
    MatchComposition(run, job.first_index, target, s.tolerances, threads, &row);
    std::vector<structure::Crystal> produced = Produced(run);
    const std::vector<CandidateCheck> checks =
        CheckCandidates(produced, s.min_distance, s.symprec, threads);
    TallyChecks(run.samples, checks, &a.prediction);
    row.unique =
        static_cast<int>(match::Deduplicate(produced, s.tolerances, threads).groups.size());
    a.prediction.unique.count += row.unique;
    a.prediction.unique.total += static_cast<std::int64_t>(produced.size());
    targets.push_back(target);
    for (auto& c : produced) prediction.push_back(std::move(c));
    prediction_checks.insert(prediction_checks.end(), checks.begin(), checks.end());
    a.compositions.push_back(std::move(row));
  }
  a.prediction.requested = static_cast<std::int64_t>(choice.assessed.size()) * k_candidates;

  std::vector<double> first_rms, best_rms;
  for (const CompositionRow& row : a.compositions) {
    ++a.matched_first.total;
    ++a.matched_any.total;
    a.matched_first.count += row.matched_first ? 1 : 0;
    a.matched_any.count += row.matched_any ? 1 : 0;
    if (row.matched_first) first_rms.push_back(row.first_rms);
    if (row.matched_any) best_rms.push_back(row.best_rms);
  }
  a.first_rms = MeanOf(first_rms);
  a.best_rms = MeanOf(best_rms);
  const DistributionSamples predicted = SamplesOf(prediction_checks);
  const DistributionSamples targeted = SamplesOf(targets);
  a.prediction.density = DistanceBetween(predicted.density, targeted.density);
  a.prediction.element_count = DistanceBetween(predicted.element_count, targeted.element_count);

  // De novo generation.
  std::vector<structure::Crystal> generated;
  if (s.de_novo_count > 0 && !generates_species) {
    a.notes.push_back(
        "de novo candidates skipped: the model takes species as given "
        "(model.species: given); de novo generation needs species: absorbing");
  }
  if (de_novo > 0 && !a.cancelled) {
    a.de_novo_run = true;
    sample::SampleJob job = BaseJob(s, kDeNovoFirstIndex, static_cast<int>(de_novo));
    job.task = sample::TaskKind::kDeNovo;
    const sample::SampleRun run =
        sample::RunSampling(bundle, job, JobObserver(observer, before, de_novo, all));
    a.evaluations += run.evaluations;
    a.cancelled = run.cancelled;
    a.de_novo.requested = de_novo;
    generated = Produced(run);
    const std::vector<CandidateCheck> checks =
        CheckCandidates(generated, s.min_distance, s.symprec, threads);
    TallyChecks(run.samples, checks, &a.de_novo);
    a.de_novo.unique.count = static_cast<std::int64_t>(
        match::Deduplicate(generated, s.tolerances, threads).groups.size());
    a.de_novo.unique.total = static_cast<std::int64_t>(generated.size());
    const DistributionSamples sampled = SamplesOf(checks);
    const DistributionSamples held_out = SamplesOf(data.held_out);
    a.de_novo.density = DistanceBetween(sampled.density, held_out.density);
    a.de_novo.element_count = DistanceBetween(sampled.element_count, held_out.element_count);
  }

  // Novelty of every produced candidate against the training structures, in one pass so the
  // training structures are prepared once.
  if (data.training.empty()) {
    a.notes.push_back("novelty not measured: no training structures given");
  } else if (!prediction.empty() || !generated.empty()) {
    std::vector<structure::Crystal> candidates = prediction;
    candidates.insert(candidates.end(), generated.begin(), generated.end());
    const match::NoveltyResult novelty =
        match::Novelty(candidates, data.training, s.tolerances, threads);
    for (std::size_t k = 0; k < candidates.size(); ++k) {
      Fraction& f = k < prediction.size() ? a.prediction.novel : a.de_novo.novel;
      ++f.total;
      f.count += novelty.novel[k] ? 1 : 0;
    }
    std::set<std::string> training_formulas;
    for (const structure::Crystal& c : data.training) {
      training_formulas.insert(structure::ReducedHillFormula(c.numbers));
    }
    const bool any_seen = std::any_of(
        a.compositions.begin(), a.compositions.end(),
        [&](const CompositionRow& r) { return training_formulas.count(r.formula) > 0; });
    if (!a.compositions.empty() && !any_seen) {
      a.notes.push_back(
          "no assessed composition occurs among the training structures, so every "
          "structure-prediction candidate is novel by construction; novelty "
          "informs about de novo candidates");
    }
  }
  if (a.cancelled) {
    a.notes.push_back("cancelled: the figures cover the " + std::to_string(a.compositions.size()) +
                      " compositions and " + std::to_string(a.de_novo.finished) +
                      " de novo candidates that finished");
  }
  return a;
}

}  // namespace nucleate::assess
