// The default demo corpus (seed 1, 6000 structures) as a whole: the floors of issue 6, validity of
// every structure, reproducibility, the stated sizes of strains and displacements, and that
// training reads it and can split it by composition.
#include <algorithm>
#include <cmath>
#include <filesystem>
#include <set>
#include <string>

#include <unistd.h>

#include <gtest/gtest.h>

#include "core/checks/validity.h"
#include "core/common/error.h"
#include "core/structure/lattice.h"
#include "core/symmetry/symmetry.h"
#include "core/train/data/composition_split.h"
#include "core/train/data/load_dataset.h"
#include "integrations/demo/corpus/catalogue.h"
#include "integrations/demo/corpus/corpus.h"
#include "integrations/demo/corpus/corpus_files.h"
#include "integrations/demo/corpus/manifest.h"

namespace nucleate::demo::corpus {
namespace {

const std::vector<PreparedType>& Catalogue() {
  static const std::vector<PreparedType> catalogue = PrepareCatalogue();
  return catalogue;
}

const Corpus& DefaultCorpus() {
  static const Corpus corpus = GenerateCorpus(Catalogue(), CorpusOptions{});
  return corpus;
}

bool Contains(const structure::Crystal& crystal, std::initializer_list<int> numbers) {
  return std::any_of(crystal.numbers.begin(), crystal.numbers.end(), [&](int z) {
    return std::find(numbers.begin(), numbers.end(), z) != numbers.end();
  });
}

// Floors from issue 6, item 2: at least 15 structure types across at least 5 crystal systems,
// 1 to 40 atoms per cell, at least 5,000 structures and 40 elements; thousands of distinct
// compositions so that a split by composition is meaningful; and every family the issue names.
TEST(DemoCorpus, DefaultCorpusMeetsTheIssueFloors) {
  const CorpusOptions defaults;
  EXPECT_EQ(defaults.seed, 1u);
  EXPECT_EQ(defaults.count, 6000);
  const Corpus& corpus = DefaultCorpus();
  const CorpusSummary s = Summarise(Catalogue(), corpus);
  EXPECT_EQ(corpus.entries.size(), 6000u);
  EXPECT_GE(s.per_type.size(), 15u);
  EXPECT_EQ(s.per_type.size(), Catalogue().size()) << "a structure type never drawn";
  EXPECT_GE(s.per_crystal_system.size(), 5u);
  EXPECT_GE(s.per_element.size(), 40u);
  EXPECT_GE(s.min_atoms, 1);
  EXPECT_LE(s.max_atoms, 40);
  EXPECT_GE(s.distinct_compositions, 2000);
  int oxides = 0, fluorides = 0, chalcogenides = 0, intermetallics = 0;
  for (const CorpusEntry& entry : corpus.entries) {
    oxides += Contains(entry.crystal, {8});
    fluorides += Contains(entry.crystal, {9});
    chalcogenides += Contains(entry.crystal, {16, 34, 52});
    const Composition& c = Catalogue()[static_cast<std::size_t>(entry.type)]
                               .compositions[static_cast<std::size_t>(entry.composition)];
    intermetallics += c.bonding == Bonding::kMetallic;
  }
  EXPECT_GE(oxides, 500);
  EXPECT_GE(fluorides, 100);
  EXPECT_GE(chalcogenides, 100);
  EXPECT_GE(intermetallics, 500);
}

// Every structure written passes core's checks with default thresholds, charge neutrality
// included: neutral in common oxidation states for ionic phases, not judged for intermetallics.
TEST(DemoCorpus, EveryStructurePassesTheValidityChecks) {
  for (const CorpusEntry& entry : DefaultCorpus().entries) {
    const checks::ValidityResult result = checks::CheckValidity(entry.crystal);
    ASSERT_TRUE(result.valid) << entry.crystal.label << ": " << result.problems[0].message;
    const Composition& c = Catalogue()[static_cast<std::size_t>(entry.type)]
                               .compositions[static_cast<std::size_t>(entry.composition)];
    ASSERT_EQ(result.charge.status, c.bonding == Bonding::kIonic
                                        ? checks::ChargeStatus::kNeutral
                                        : checks::ChargeStatus::kNotApplicable)
        << entry.crystal.label;
  }
}

TEST(DemoCorpus, SameSeedGivesTheSameBytes) {
  const CorpusOptions options;
  const Corpus again = GenerateCorpus(Catalogue(), options);
  EXPECT_EQ(StructureSetBytes(again), StructureSetBytes(DefaultCorpus()));
  EXPECT_EQ(ManifestJson(Catalogue(), again, options, "corpus.pb"),
            ManifestJson(Catalogue(), DefaultCorpus(), options, "corpus.pb"));
  CorpusOptions other;
  other.seed = 2;
  other.count = 200;
  CorpusOptions first_200;
  first_200.count = 200;
  EXPECT_NE(StructureSetBytes(GenerateCorpus(Catalogue(), other)),
            StructureSetBytes(GenerateCorpus(Catalogue(), first_200)));
}

// Structure i depends on the seed and i only: a shorter corpus is a prefix of the longer one.
TEST(DemoCorpus, ShorterCorpusIsAPrefix) {
  CorpusOptions options;
  options.count = 250;
  const Corpus shorter = GenerateCorpus(Catalogue(), options);
  Corpus prefix;
  prefix.entries.assign(DefaultCorpus().entries.begin(), DefaultCorpus().entries.begin() + 250);
  EXPECT_EQ(StructureSetBytes(shorter), StructureSetBytes(prefix));
}

// The strain keeps the type's symmetry and the displacements stay far inside the 0.1 angstrom
// tolerance training uses for space groups (core/train CONFIG.md, data.symprec). 150 structures:
// spglib is slow on cubic cells.
TEST(DemoCorpus, SpaceGroupSurvivesStrainAndDisplacement) {
  for (std::size_t k = 0; k < 150; ++k) {
    const CorpusEntry& entry = DefaultCorpus().entries[k];
    const PreparedType& type = Catalogue()[static_cast<std::size_t>(entry.type)];
    EXPECT_EQ(symmetry::AnalyseSymmetry(entry.crystal, 0.1).number, type.type->group->number)
        << entry.crystal.label;
  }
}

// The same draws without strain or without displacement show their sizes: every cell vector
// within 2 % of the unstrained one, and displacements of 0.01 angstrom root mean square
// (measured over about 4,000 atoms, so within a few percent).
TEST(DemoCorpus, StrainAndDisplacementHaveTheStatedSizes) {
  CorpusOptions unstrained, undisplaced;
  unstrained.max_strain = 0;
  undisplaced.displacement_rms = 0;
  double squared = 0;
  std::size_t atoms = 0;
  for (std::int64_t index = 0; index < 500; ++index) {
    const CorpusEntry& entry = DefaultCorpus().entries[static_cast<std::size_t>(index)];
    const structure::Crystal ideal = DrawStructure(Catalogue(), unstrained, index, 0).crystal;
    for (int row = 0; row < 3; ++row) {
      const double ratio = entry.crystal.lattice.row(row).norm() / ideal.lattice.row(row).norm();
      EXPECT_LE(std::abs(ratio - 1), 0.02 + 1e-12) << entry.crystal.label;
    }
    const structure::Crystal still = DrawStructure(Catalogue(), undisplaced, index, 0).crystal;
    ASSERT_EQ(still.size(), entry.crystal.size());
    for (std::size_t k = 0; k < still.size(); ++k) {
      Eigen::Vector3d delta = entry.crystal.frac[k] - still.frac[k];
      for (int d = 0; d < 3; ++d) delta[d] -= std::round(delta[d]);
      squared += structure::FractionalToCartesian(entry.crystal.lattice, delta).squaredNorm();
      ++atoms;
    }
  }
  EXPECT_GT(atoms, 3000u);
  EXPECT_NEAR(std::sqrt(squared / static_cast<double>(atoms)), CorpusOptions{}.displacement_rms,
              0.05 * CorpusOptions{}.displacement_rms);
}

// Training reads the StructureSet file (data.structure_set) and keeps every structure (the first
// 200: reading labels each cell with spglib, which takes about 13 ms a cell here).
TEST(DemoCorpus, TrainingReadsTheStructureSet) {
  Corpus first;
  first.entries.assign(DefaultCorpus().entries.begin(), DefaultCorpus().entries.begin() + 200);
  const std::filesystem::path folder = std::filesystem::temp_directory_path() /
                                       ("nucleate_corpus_test_" + std::to_string(::getpid()));
  std::filesystem::create_directories(folder);
  const std::filesystem::path file = folder / "corpus.pb";
  WriteFileAtomically(file, StructureSetBytes(first));
  train::data::DataSource source;
  source.structure_set_file = file.string();
  const train::data::Dataset dataset = train::data::LoadDataset(source);
  std::filesystem::remove_all(folder);
  ASSERT_EQ(dataset.examples.size(), first.entries.size());
  EXPECT_EQ(dataset.report.structures_skipped, 0);
  for (std::size_t k = 0; k < first.entries.size(); ++k) {
    EXPECT_EQ(dataset.examples[k].source, first.entries[k].crystal.label);
    EXPECT_EQ(dataset.examples[k].formula,
              Catalogue()[static_cast<std::size_t>(first.entries[k].type)]
                  .compositions[static_cast<std::size_t>(first.entries[k].composition)]
                  .formula);
  }
}

// The split by composition that training makes (split: in its YAML) puts each formula in one
// split and, with thousands of formulas, comes close to the requested fractions.
TEST(DemoCorpus, SplitByCompositionIsMeaningful) {
  std::vector<train::data::TrainingExample> examples;
  for (const CorpusEntry& entry : DefaultCorpus().entries) {
    train::data::TrainingExample example;
    example.formula = Catalogue()[static_cast<std::size_t>(entry.type)]
                          .compositions[static_cast<std::size_t>(entry.composition)]
                          .formula;
    examples.push_back(example);
  }
  const train::data::DatasetSplit split = train::data::SplitByComposition(examples, 0.1, 0.1, 1);
  const double n = static_cast<double>(examples.size());
  EXPECT_NEAR(static_cast<double>(split.validation.size()) / n, 0.1, 0.03);
  EXPECT_NEAR(static_cast<double>(split.test.size()) / n, 0.1, 0.03);
  std::set<std::string> train_formulas, test_formulas;
  for (std::size_t i : split.train) train_formulas.insert(examples[i].formula);
  for (std::size_t i : split.test) test_formulas.insert(examples[i].formula);
  for (const std::string& formula : test_formulas) EXPECT_EQ(train_formulas.count(formula), 0u);
  EXPECT_GE(test_formulas.size(), 100u);
}

TEST(DemoCorpus, BadOptionsNameTheOption) {
  const auto field_of = [](const CorpusOptions& options) {
    try {
      ValidateOptions(options);
    } catch (const Error& error) {
      EXPECT_EQ(error.kind(), ErrorKind::kInvalidArgument);
      return error.field();
    }
    return std::string("no error");
  };
  CorpusOptions options;
  options.count = 0;
  EXPECT_EQ(field_of(options), "count");
  options = CorpusOptions{};
  options.max_strain = 0.5;
  EXPECT_EQ(field_of(options), "max_strain");
  options = CorpusOptions{};
  options.displacement_rms = -0.01;
  EXPECT_EQ(field_of(options), "displacement_rms");
  EXPECT_EQ(field_of(CorpusOptions{}), "no error");
}

}  // namespace
}  // namespace nucleate::demo::corpus
