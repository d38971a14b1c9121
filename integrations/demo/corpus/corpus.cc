#include "integrations/demo/corpus/corpus.h"

#include <cmath>
#include <cstdio>
#include <set>

#include "core/checks/validity.h"
#include "core/common/error.h"
#include "integrations/demo/corpus/corpus_cell.h"

namespace nucleate::demo::corpus {
namespace {

std::uint32_t Index32(std::int64_t index) { return static_cast<std::uint32_t>(index); }

int DrawTypeIndex(const std::vector<PreparedType>& catalogue, random::RandomStream& stream) {
  double total = 0;
  for (const PreparedType& type : catalogue) total += type.weight;
  const double u = stream.Uniform() * total;
  double cumulative = 0;
  for (std::size_t t = 0; t < catalogue.size(); ++t) {
    cumulative += catalogue[t].weight;
    if (u < cumulative) return static_cast<int>(t);
  }
  return static_cast<int>(catalogue.size()) - 1;  // u rounded up to the total
}

std::string Label(std::int64_t index, const PreparedType& type, const Composition& composition) {
  char number[16];
  std::snprintf(number, sizeof number, "%06lld", static_cast<long long>(index));
  return std::string(number) + "-" + type.type->name + "-" + composition.formula;
}

}  // namespace

void ValidateOptions(const CorpusOptions& options) {
  if (options.count < 1 || options.count > kMaxCount) {
    throw InvalidArgument("count", "must be in 1.." + std::to_string(kMaxCount) + ", got " +
                                       std::to_string(options.count));
  }
  if (!(options.max_strain >= 0 && options.max_strain <= 0.1)) {
    throw InvalidArgument("max_strain", "must be in 0..0.1, got " + std::to_string(options.max_strain));
  }
  if (!(options.displacement_rms >= 0 && options.displacement_rms <= 0.1)) {
    throw InvalidArgument("displacement_rms", "must be in 0..0.1 angstrom, got " +
                                                  std::to_string(options.displacement_rms));
  }
}

CorpusEntry DrawStructure(const std::vector<PreparedType>& catalogue, const CorpusOptions& options,
                          std::int64_t index, int attempt) {
  const std::uint32_t item = Index32(index), step = static_cast<std::uint32_t>(attempt);
  random::RandomStream type_stream(options.seed, item, step, kDrawType);
  random::RandomStream composition_stream(options.seed, item, step, kDrawComposition);
  random::RandomStream strain_stream(options.seed, item, step, kDrawStrain);
  random::RandomStream displacement_stream(options.seed, item, step, kDrawDisplacement);

  CorpusEntry entry;
  entry.type = DrawTypeIndex(catalogue, type_stream);
  const PreparedType& type = catalogue[static_cast<std::size_t>(entry.type)];
  entry.composition = static_cast<int>(
      composition_stream.Below(static_cast<std::uint32_t>(type.compositions.size())));
  const Composition& composition = type.compositions[static_cast<std::size_t>(entry.composition)];
  const Strain strain = StrainFor(type.system, options.max_strain, strain_stream);
  entry.crystal = AssembleCrystal(type, composition, strain, options.displacement_rms,
                                  displacement_stream);
  entry.crystal.label = Label(index, type, composition);
  return entry;
}

Corpus GenerateCorpus(const std::vector<PreparedType>& catalogue, const CorpusOptions& options) {
  ValidateOptions(options);
  checks::ValidateThresholds(checks::ValidityThresholds{});
  Corpus corpus;
  corpus.entries.reserve(static_cast<std::size_t>(options.count));
  for (std::int64_t index = 0; index < options.count; ++index) {
    for (int attempt = 0;; ++attempt) {
      if (attempt == kMaxAttempts) {
        throw Internal("structure " + std::to_string(index) + " failed the validity checks in " +
                       std::to_string(kMaxAttempts) + " draws in a row");
      }
      CorpusEntry entry = DrawStructure(catalogue, options, index, attempt);
      const checks::ValidityResult result = checks::CheckValidity(entry.crystal);
      if (result.valid) {
        corpus.entries.push_back(std::move(entry));
        break;
      }
      ++corpus.dropped;
      std::set<std::string> codes;
      for (const checks::Problem& problem : result.problems) {
        codes.insert(checks::ProblemCodeName(problem.code));
      }
      for (const std::string& code : codes) ++corpus.dropped_by_problem[code];
    }
  }
  return corpus;
}

}  // namespace nucleate::demo::corpus
