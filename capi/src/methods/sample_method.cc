#include "methods/sample_method.h"

#include <map>
#include <string>
#include <vector>

#include "core/common/require.h"
#include "core/sample/sampler.h"
#include "core/structure/composition.h"
#include "core/symmetry/symmetry.h"
#include "error_detail.h"
#include "methods/candidate_groups.h"
#include "methods/match_methods.h"
#include "methods/requested_model.h"
#include "methods/structure_inputs.h"
#include "methods/structure_report.h"
#include "methods/within_field.h"
#include "nucleate/v1/sample.pb.h"

namespace nucleate::capi {

sample::SamplerSettings SamplerFromMessage(const v1::SamplerSettings& m) {
  sample::SamplerSettings s;  // core's defaults are the only defaults
  switch (m.kind()) {
    case v1::SAMPLER_KIND_UNSPECIFIED:
    case v1::SAMPLER_KIND_DDPM: s.kind = sample::SamplerKind::kDdpm; break;
    case v1::SAMPLER_KIND_DDIM: s.kind = sample::SamplerKind::kDdim; break;
    case v1::SAMPLER_KIND_PREDICTOR_CORRECTOR: s.kind = sample::SamplerKind::kPredictorCorrector; break;
    case v1::SAMPLER_KIND_PROBABILITY_FLOW: s.kind = sample::SamplerKind::kProbabilityFlow; break;
    default: throw InvalidArgument("sampler.kind", "unknown sampler " + std::to_string(m.kind()));
  }
  switch (m.ddpm_variance()) {
    case v1::DDPM_VARIANCE_UNSPECIFIED:
    case v1::DDPM_VARIANCE_POSTERIOR: s.ddpm_variance = sample::DdpmVariance::kPosterior; break;
    case v1::DDPM_VARIANCE_FORWARD: s.ddpm_variance = sample::DdpmVariance::kForward; break;
    default:
      throw InvalidArgument("sampler.ddpm_variance", "unknown value " + std::to_string(m.ddpm_variance()));
  }
  if (m.has_steps()) s.steps = m.steps();
  if (m.has_eta()) s.eta = m.eta();
  if (m.has_corrector_steps()) s.corrector_steps = m.corrector_steps();
  if (m.has_snr()) s.snr = m.snr();
  if (m.has_lattice_clip()) s.lattice_clip = m.lattice_clip();
  return s;
}

sample::SampleLimits LimitsFromMessage(const v1::SampleLimits& m) {
  sample::SampleLimits l;
  if (m.has_max_atoms()) l.max_atoms = m.max_atoms();
  if (m.has_max_count()) l.max_count = m.max_count();
  if (m.has_max_evaluations()) l.max_evaluations = m.max_evaluations();
  if (m.has_max_memory_bytes()) l.max_memory_bytes = m.max_memory_bytes();
  if (l.max_atoms < 1) throw InvalidArgument("limits.max_atoms", "must be >= 1");
  if (l.max_count < 1) throw InvalidArgument("limits.max_count", "must be >= 1");
  if (l.max_evaluations < 1) throw InvalidArgument("limits.max_evaluations", "must be >= 1");
  if (l.max_memory_bytes < 1) throw InvalidArgument("limits.max_memory_bytes", "must be >= 1");
  return l;
}

const char* CandidateCaution() {
  return "Candidates are hypotheses from a statistical model, not predictions of stable compounds: "
         "confirm them with DFT and experiment, and follow local safety rules and licensed "
         "practice for any element flagged toxic or radioactive.";
}

namespace {

// The structure limits of this request live in field structure_limits (FromMessage names its
// errors "limits.<field>", the name Check and Match use).
InputLimits StructureLimitsFromMessage(const v1::StructureLimits& m) {
  try {
    return FromMessage(m);
  } catch (const Error& e) {
    const std::string prefix = "limits.";
    if (e.field().rfind(prefix, 0) != 0) throw;
    throw Error(e.kind(), "structure_limits." + e.field().substr(prefix.size()), e.detail());
  }
}

sample::SampleJob JobFromMessage(const v1::SampleRequest& r, const InputLimits& input_limits) {
  sample::SampleJob job;
  switch (r.task_case()) {
    case v1::SampleRequest::kComposition: {
      const v1::CompositionTask& t = r.composition();
      job.task = sample::TaskKind::kComposition;
      job.composition.formula = structure::ParseFormula(t.formula(), "composition.formula");
      job.composition.min_units = t.has_min_formula_units() ? t.min_formula_units() : 1;
      job.composition.max_units =
          t.has_max_formula_units() ? t.max_formula_units() : job.composition.min_units;
      break;
    }
    case v1::SampleRequest::kDeNovo: {
      const v1::DeNovoTask& t = r.de_novo();
      job.task = sample::TaskKind::kDeNovo;
      job.de_novo.allowed_elements.assign(t.allowed_elements().begin(), t.allowed_elements().end());
      if (t.has_min_atoms()) job.de_novo.min_atoms = t.min_atoms();
      if (t.has_max_atoms()) job.de_novo.max_atoms = t.max_atoms();
      break;
    }
    case v1::SampleRequest::kVariation: {
      const v1::VariationTask& t = r.variation();
      job.task = sample::TaskKind::kVariation;
      job.variation.structure = ReadOneStructure(t.structure(), input_limits, "variation.structure");
      if (t.has_strength()) job.variation.strength = t.strength();
      job.variation.vary_species = t.vary_species();
      break;
    }
    case v1::SampleRequest::kConstrained: {
      const v1::ConstrainedTask& t = r.constrained();
      job.task = sample::TaskKind::kConstrained;
      job.constrained.structure =
          ReadOneStructure(t.structure(), input_limits, "constrained.structure");
      job.constrained.fixed_atoms.assign(t.fixed_atoms().begin(), t.fixed_atoms().end());
      job.constrained.fix_lattice = t.fix_lattice();
      job.constrained.added_atoms.assign(t.added_atoms().begin(), t.added_atoms().end());
      break;
    }
    case v1::SampleRequest::TASK_NOT_SET:
      throw InvalidArgument("task", "required: one of composition, de_novo, variation, constrained");
  }
  const v1::SampleConditions& c = r.conditions();
  job.conditions.use_composition = c.has_use_composition() ? c.use_composition() : true;
  job.conditions.crystal_system = c.crystal_system();
  job.conditions.space_group = c.space_group();
  // Sorted by name, so the order never depends on the map's iteration order.
  const std::map<std::string, double> sorted(c.properties().begin(), c.properties().end());
  job.conditions.properties.assign(sorted.begin(), sorted.end());
  if (c.has_guidance()) job.conditions.guidance = c.guidance();
  job.sampler = SamplerFromMessage(r.sampler());
  job.seed = r.seed();
  job.first_index = r.first_index();
  job.count = r.has_count() ? r.count() : 1;
  job.threads = r.has_threads() ? r.threads() : 0;
  job.limits = LimitsFromMessage(r.limits());
  return job;
}

void HandleSample(const v1::SampleRequest& request, v1::SampleReply* reply,
                  const CallContext& context) {
  if (request.model_path().empty()) throw InvalidArgument("model_path", "required: the model file");
  const InputLimits input_limits = StructureLimitsFromMessage(request.structure_limits());
  // Everything a request can get wrong is checked before the model is read or a chain runs.
  const checks::ValidityThresholds thresholds =
      WithinField("thresholds", [&] { return ThresholdsFromMessage(request.thresholds()); });
  WithinField("thresholds", [&] { checks::ValidateThresholds(thresholds); });
  const double symprec = request.has_symprec() ? request.symprec() : symmetry::kDefaultSymprec;
  RequirePositiveFinite("symprec", symprec);
  const match::MatchTolerances tolerances = TolerancesFromMessage(request.tolerances());
  const sample::SampleJob job = JobFromMessage(request, input_limits);
  reply->set_caution(CandidateCaution());

  const model::ModelBundle bundle = LoadRequestedModel(request.model_path(), "model_path");
  const sample::SampleRun run = sample::RunSampling(
      bundle, job, [&](std::int64_t done, std::int64_t total) {
        return context.ReportProgress(static_cast<double>(done) / static_cast<double>(total),
                                      "sample");
      });

  v1::SampleSummary* summary = reply->mutable_summary();
  summary->set_requested(static_cast<int>(job.count));
  summary->set_cancelled(run.cancelled);
  summary->set_evaluations(run.evaluations);
  std::vector<structure::Crystal> finished;
  std::vector<int> candidate_of;  // position in `finished` -> candidate in the reply
  for (const sample::SampleOutcome& outcome : run.samples) {
    v1::Candidate* candidate = reply->add_candidates();
    candidate->set_index(outcome.index);
    candidate->set_group(-1);
    v1::StructureReport* report = candidate->mutable_report();
    report->set_source("sample-" + std::to_string(outcome.index));
    report->set_index(static_cast<int>(reply->candidates_size() - 1));
    summary->set_finished(summary->finished() + 1);
    if (outcome.error) {
      FillErrorDetail(*outcome.error, "Sample", report->mutable_error());
      summary->set_failed(summary->failed() + 1);
      continue;
    }
    const structure::Crystal& crystal = *outcome.crystal;
    ToMessage(crystal, candidate->mutable_structure());
    CheckOne(crystal, thresholds, input_limits, symprec, symmetry::kDefaultAngleTolerance, report);
    if (report->valid()) summary->set_valid(summary->valid() + 1);
    if (request.symmetrise() && report->space_group_number() > 0) {
      try {
        ToMessage(symmetry::Symmetrise(crystal, symprec), candidate->mutable_symmetrised());
      } catch (const Error& e) {
        report->add_warnings(std::string("symmetrise: ") + e.what());
      }
    }
    finished.push_back(crystal);
    candidate_of.push_back(reply->candidates_size() - 1);
  }

  GroupCandidates(finished, candidate_of, tolerances, job.threads, reply);
}

}  // namespace

MethodEntry SampleMethod() {
  return MakeMethod<v1::SampleRequest, v1::SampleReply, &HandleSample>("Sample");
}

}  // namespace nucleate::capi
