// The manifest written beside the corpus: what was generated, from which seed and sources, and
// how the structures spread over types, crystal systems, elements and atom counts.
#pragma once

#include <cstdint>
#include <map>
#include <string>
#include <vector>

#include "integrations/demo/corpus/catalogue.h"
#include "integrations/demo/corpus/corpus.h"

namespace nucleate::demo::corpus {

struct CorpusSummary {
  std::map<std::string, std::int64_t> per_type;          // structure type name -> structures
  std::map<std::string, std::int64_t> compositions_per_type;  // distinct formulas drawn
  std::map<std::string, std::int64_t> per_crystal_system;
  std::map<std::string, std::int64_t> per_element;       // symbol -> structures containing it
  std::map<int, std::int64_t> atom_counts;               // atoms per cell -> structures
  std::int64_t distinct_compositions = 0;                // reduced formulas
  int min_atoms = 0, max_atoms = 0;
  std::vector<std::string> toxic_elements;               // symbols present, core's flag
  std::vector<std::string> radioactive_elements;
};

CorpusSummary Summarise(const std::vector<PreparedType>& catalogue, const Corpus& corpus);

// Pretty-printed JSON, keys in a fixed order, so the same seed gives the same bytes.
std::string ManifestJson(const std::vector<PreparedType>& catalogue, const Corpus& corpus,
                         const CorpusOptions& options, const std::string& structure_set_file);

}  // namespace nucleate::demo::corpus
