// What the data pipeline hands to training: one entry per usable structure, and an account of
// everything that was not usable.
#pragma once

#include <cstdint>
#include <string>
#include <vector>

#include "core/structure/crystal.h"

namespace nucleate::train::data {

struct TrainingExample {
  // Niggli-reduced cell (one consistent basis for the network), fractional coordinates wrapped to
  // [0, 1); label = source. crystal.properties keeps what the file itself carried.
  structure::Crystal crystal;
  std::string source;            // "<file>#<block>", "<file>@<frame>" or the set's label
  std::string formula;           // reduced Hill formula ("ClNa"): the unit of the split
  int crystal_system = 0;        // 1..7 triclinic..cubic; 0 when no space group was found
  int space_group = 0;           // 1..230; 0 when none was found
  // One value per DataSource::property_names, NaN where the structure has none.
  std::vector<double> properties;
};

struct DatasetProblem {
  std::string source;  // the file, structure, or "<csv>:<line>" it is about
  std::string reason;
};

struct DatasetReport {
  // Entries kept in `problems`; the rest are only counted, so a set of a million bad files
  // cannot exhaust memory through its report.
  static constexpr std::size_t kMaxListedProblems = 1000;

  std::int64_t files_read = 0;          // files whose content was parsed (bad structures or not)
  // Structure files that could not be read at all (too large, unreadable, a folder or a broken
  // link named *.cif); each is a problem.
  std::int64_t files_skipped = 0;
  std::int64_t files_ignored = 0;       // directory entries not named *.cif, *.xyz or *.extxyz
  std::int64_t structures_kept = 0;     // became training examples
  std::int64_t structures_skipped = 0;  // found but unusable (each is a problem)
  std::int64_t property_values_rejected = 0;  // non-numeric or non-finite values, left missing
  std::int64_t property_rows_rejected = 0;    // CSV rows naming no structure, malformed, repeated
  std::vector<DatasetProblem> problems;       // in the order found, at most kMaxListedProblems
  std::int64_t problems_not_listed = 0;
  // Warnings of the readers (merged duplicate sites, ...), prefixed by the source, capped alike.
  std::vector<std::string> warnings;
  std::int64_t warnings_not_listed = 0;

  void AddProblem(std::string source, std::string reason);
  void AddWarning(std::string warning);
};

struct Dataset {
  std::vector<TrainingExample> examples;  // in source order: file names sorted, then file order
  DatasetReport report;
};

}  // namespace nucleate::train::data
