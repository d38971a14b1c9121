// How good is a trained model? Samples candidates for held-out compositions and de novo, and
// measures them: match rates with 1 and K candidates, validity, charge neutrality, symmetry,
// uniqueness, novelty, and distribution distances of density and element count. Every figure
// carries its sample size (a rate from 20 samples is not a rate from 2,000). The definitions are
// in DESIGN.md beside this file; the candidates themselves are hypotheses, not results.
#pragma once

#include <cstdint>
#include <functional>
#include <limits>
#include <string>
#include <vector>

#include "core/match/tolerances.h"
#include "core/model/bundle/model_bundle.h"
#include "core/sample/sample_job.h"
#include "core/sample/sampler_settings.h"
#include "core/structure/crystal.h"

namespace nucleate::assess {

struct AssessSettings {
  // Held-out compositions assessed: the first N in byte order of their reduced Hill formulas,
  // among those the model can sample (elements in its vocabulary, cell within limits.max_atoms).
  int compositions = 100;
  int candidates_per_composition = 20;  // K
  int de_novo_count = 0;                // D; models with generated species only
  sample::SamplerSettings sampler;
  std::uint32_t seed = 0;
  int threads = 0;            // 0 = every core; no figure depends on it
  double min_distance = 0.5;  // angstrom: structural validity (common practice, no source)
  double symprec = 0.1;       // angstrom: spglib tolerance for the space group after sampling
  match::MatchTolerances tolerances;  // matching, uniqueness and novelty
  sample::SampleLimits limits;        // max_count bounds all candidates of the call together
};

struct AssessData {
  // Structures the model was not trained on; labels name them in the report.
  std::vector<structure::Crystal> held_out;
  // Structures it was trained on, for novelty; empty: novelty is not measured.
  std::vector<structure::Crystal> training;
};

// count of total; value NaN when total is 0 (not measured).
struct Fraction {
  std::int64_t count = 0;
  std::int64_t total = 0;
  double value() const {
    return total > 0 ? static_cast<double>(count) / static_cast<double>(total)
                     : std::numeric_limits<double>::quiet_NaN();
  }
};

struct Mean {
  double value = std::numeric_limits<double>::quiet_NaN();  // NaN when sample_size is 0
  std::int64_t sample_size = 0;
};

// Wasserstein-1 distance (wasserstein.h) between the candidates' values and the reference's.
struct Distance {
  double value = std::numeric_limits<double>::quiet_NaN();  // NaN when either side is empty
  std::int64_t candidates = 0;
  std::int64_t reference = 0;
};

// One assessed held-out composition.
struct CompositionRow {
  std::string formula;         // reduced Hill formula ("ClNa")
  int formula_units = 0;       // Z of the target cell: atoms / atoms of the reduced formula
  int atoms = 0;               // of the target cell
  std::string target;          // label of the held-out cell matched against
  int finished = 0;            // chains that ran to the end (K unless cancelled)
  int failed = 0;              // of them, chains that ended in an error
  int matches = 0;             // candidates matching the target
  bool matched_first = false;  // the first candidate (lowest index) matches
  bool matched_any = false;
  double first_rms = std::numeric_limits<double>::quiet_NaN();  // when matched_first
  double best_rms = std::numeric_limits<double>::quiet_NaN();   // lowest among matches
  int unique = 0;  // duplicate groups among the produced candidates
};

struct SkippedComposition {
  std::string formula;
  std::string reason;  // "elements the model does not know: Xe", "24 atoms, above ..."
};

// Figures of one set of candidates. "Produced": finished without error, so a structure exists.
struct CandidateFigures {
  std::int64_t requested = 0;
  std::int64_t finished = 0;  // chains that ran to the end
  std::int64_t failed = 0;    // of them, ended in an error: no structure
  Fraction valid;             // min distance >= min_distance, of finished (failed count invalid)
  Fraction charge_neutral;    // neutral in common oxidation states, of produced where it applies
  std::int64_t charge_not_applicable = 0;  // produced with no element of negative common state
  Fraction symmetric;                      // space group number > 2 at symprec, of produced
  Fraction unique;         // duplicate groups, of produced (per composition, pooled)
  Fraction novel;          // matching no training structure, of produced
  Distance density;        // g/cm3
  Distance element_count;  // distinct elements per cell
};

struct Assessment {
  std::int64_t held_out_structures = 0;
  std::int64_t held_out_compositions = 0;
  std::int64_t training_structures = 0;
  int candidates_per_composition = 0;

  // Structure prediction.
  std::vector<CompositionRow> compositions;  // in the order assessed
  std::vector<SkippedComposition> skipped;   // held-out compositions the model cannot sample
  Fraction matched_first;                    // compositions whose first candidate matches
  Fraction matched_any;                      // compositions with a match among K
  Mean first_rms;                            // over compositions matched by the first candidate
  Mean best_rms;                             // lowest rms per matched composition, averaged
  CandidateFigures prediction;               // all candidates of the compositions above

  // De novo generation: run only when asked for and the model generates species.
  bool de_novo_run = false;
  CandidateFigures de_novo;

  std::vector<std::string> notes;  // what was skipped or not measured, and why
  bool cancelled = false;          // the observer stopped the run: figures cover what finished
  std::int64_t evaluations = 0;    // network evaluations
};

// Called on the calling thread with the work done and the total, in sample steps (one candidate
// moved one level) over all candidates of the call; returning false cancels: sampling stops, a
// composition whose candidates did not all finish is left out, finished de novo candidates are
// kept, and the figures cover what finished (Assessment::cancelled says so).
using AssessObserver = std::function<bool(std::int64_t done, std::int64_t total)>;

// The checks that need no model: InvalidArgument naming the AssessSettings field
// ("compositions", "candidates_per_composition", "de_novo_count", "threads", "min_distance",
// "symprec", "tolerances.<field>", "limits.max_count", "limits.max_atoms"). A caller may run them
// before reading a model; Assess runs them too.
void ValidateAssessSettings(const AssessSettings& settings);

// ValidateAssessSettings and ValidateSamplerSettings against the model ("sampler.<field>")
// before anything runs; InvalidArgument("held_out") when there are no held-out structures;
// LimitExceeded("limits.max_count") when the call's candidates exceed it; and the errors of
// RunSampling, Deduplicate and Novelty.
Assessment Assess(const model::ModelBundle& bundle, const AssessData& data,
                  const AssessSettings& settings, const AssessObserver& observer = {});

}  // namespace nucleate::assess
