// Drawing the corpus: for each structure index, a structure type, a composition, a strain and
// displacements, from random streams fixed by the seed and the index alone; then nucleate's
// validity checks, with a fresh draw in place of any structure that fails them.
//
// Random streams (core/random, Philox4x32-10): key = (seed, structure index); counter step = the
// attempt (0 for the first draw of an index, 1 after one drop, ...); purpose = one of this tool's
// own values below, so each draw has its own stream and changing one (say, the displacements)
// never moves the others. They lie outside the values core/random names (1..13) so that nobody
// reading a stream's key takes it for a training or sampling stream. Structure i therefore
// depends on the seed and i only: a larger --count appends structures and keeps the first ones.
#pragma once

#include <cstdint>
#include <map>
#include <string>
#include <vector>

#include "core/random/random_stream.h"
#include "core/structure/crystal.h"
#include "integrations/demo/corpus/catalogue.h"

namespace nucleate::demo::corpus {

// Written into the manifest; bump it when the same seed would give a different corpus.
constexpr int kGeneratorVersion = 1;

constexpr random::Purpose kDrawType = static_cast<random::Purpose>(1001);
constexpr random::Purpose kDrawComposition = static_cast<random::Purpose>(1002);
constexpr random::Purpose kDrawStrain = static_cast<random::Purpose>(1003);
constexpr random::Purpose kDrawDisplacement = static_cast<random::Purpose>(1004);

constexpr std::int64_t kMaxCount = 1000000;
// Fresh draws for one index before giving up: a table that fails this often is broken.
constexpr int kMaxAttempts = 64;

struct CorpusOptions {
  std::uint32_t seed = 1;
  std::int64_t count = 6000;
  double max_strain = 0.02;         // relative change of each free cell parameter
  // Angstrom, root mean square length of an atom's displacement. At 0.02, about 5 % of cells
  // (15 of the first 300 at seed 1) no longer show their space group to spglib at the 0.1 angstrom
  // tolerance training labels them with; at 0.01, none of those 300 did.
  double displacement_rms = 0.01;
};

struct CorpusEntry {
  structure::Crystal crystal;  // label "<index>-<type>-<formula>", e.g. "000042-spinel-Al2MgO4"
  int type = 0;                // index into the catalogue
  int composition = 0;         // index into that type's compositions
};

struct Corpus {
  std::vector<CorpusEntry> entries;
  std::int64_t dropped = 0;                                // draws that failed the checks
  std::map<std::string, std::int64_t> dropped_by_problem;  // core problem code name -> draws
};

// InvalidArgument naming "count" (1..kMaxCount), "max_strain" (0..0.1) or "displacement_rms"
// (0..0.1 angstrom) for an option out of range.
void ValidateOptions(const CorpusOptions& options);

// Draw `attempt` of structure `index`, unchecked.
CorpusEntry DrawStructure(const std::vector<PreparedType>& catalogue, const CorpusOptions& options,
                          std::int64_t index, int attempt);

// options.count structures, each passing core/checks CheckValidity with default thresholds.
// Raises kInternal when one index fails kMaxAttempts draws in a row.
Corpus GenerateCorpus(const std::vector<PreparedType>& catalogue, const CorpusOptions& options);

}  // namespace nucleate::demo::corpus
