// Which held-out compositions are assessed, and against which cell: grouped by reduced formula,
// in byte order of the formulas (a choice that does not depend on the order of the files), the
// first cell of each composition in input order as its target, the first N the model can
// sample.
#pragma once

#include <string>
#include <utility>
#include <vector>

#include "core/assess/assessment.h"
#include "core/model/architecture.h"

namespace nucleate::assess {

struct CompositionTarget {
  std::string formula;                       // reduced Hill formula
  std::vector<std::pair<int, int>> reduced;  // (atomic number, count) of the reduced formula
  int formula_units = 0;                     // Z of the target cell
  std::size_t target = 0;                    // index into the held-out structures
};

struct CompositionChoice {
  std::vector<CompositionTarget> assessed;  // at most `limit`, formula order
  std::vector<SkippedComposition> skipped;  // ahead of the last assessed one, formula order
  std::int64_t compositions = 0;            // distinct reduced formulas held out
};

// Held-out cells whose composition holds an element outside `architecture.elements`, or which
// have more than max_atoms atoms, cannot be sampled: they are skipped with the reason, and the
// next composition takes their place. InvalidArgument("held_out[k]") for a cell with an atomic
// number outside 1..118.
CompositionChoice ChooseCompositions(const std::vector<structure::Crystal>& held_out,
                                     const model::Architecture& architecture, int limit,
                                     int max_atoms);

}  // namespace nucleate::assess
