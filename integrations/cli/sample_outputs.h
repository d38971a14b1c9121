// The files of `nucleate sample` in the out folder: one CIF per candidate (sample-<index>.cif) or
// one multi-block candidates.cif, the symmetrised CIFs when asked, candidates.xyz (every finished
// candidate, one extended XYZ frame each), report.html (a table with flags and a drawing of each
// cell) and summary.jsonl (one JSON object per candidate).
// Every file is written atomically, summary.jsonl last.
#pragma once

#include <string>
#include <vector>

#include "sample_reply.h"
#include "sample_request.h"

namespace nucleate::cli {

// The names the plan can write, relative to the out folder.
std::vector<std::string> PlannedOutputNames(const SamplePlan& plan);

// Creates the out folder when missing (true when it did). Without --force, refuses
// (CLI::ValidationError naming --out and the file) when any file the plan can write is there
// already: checked before sampling, so no time is spent on a run whose files could not be written.
bool PrepareOutputFolder(const SamplePlan& plan);

// Writes the files and records their names in result->rows. Returns the paths written.
std::vector<std::string> WriteSampleOutputs(const SampleOutputOptions& options,
                                            SampleResult* result);

}  // namespace nucleate::cli
