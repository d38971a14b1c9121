#include "tests/bench/side_by_side/side_by_side_batch.h"

#include <cmath>
#include <cstdint>
#include <random>

#include "core/common/error.h"
#include "core/model/diffusion.h"
#include "core/random/random_stream.h"
#include "core/structure/lattice.h"

namespace nucleate::bench {
namespace {

// Seed of the invented cells and of their noise draws; any fixed value serves.
constexpr std::uint32_t kSeed = 20261202;

// Uniform on [0, 1) from the top 53 bits: std::uniform_real_distribution is not pinned by the
// standard, this is, so the cells are the same with any standard library.
double Uniform(std::mt19937_64* rng) { return static_cast<double>((*rng)() >> 11) * 0x1.0p-53; }
int Below(std::mt19937_64* rng, int n) { return static_cast<int>((*rng)() % static_cast<std::uint64_t>(n)); }

// An invented 20-atom cell: two or three elements of the vocabulary in random proportions,
// random positions, a cell of 11 to 19 cubic angstrom per atom with angles of 80 to 100 degrees.
train::CleanCell InventCell(const model::Architecture& arch,
                            const model::LatticeStatistics& statistics, int index,
                            std::mt19937_64* rng) {
  const int vocabulary = static_cast<int>(arch.elements.size());
  const int kinds = 2 + index % 2;
  std::vector<int> tokens;
  while (static_cast<int>(tokens.size()) < kinds) {
    const int token = Below(rng, vocabulary);
    bool seen = false;
    for (int t : tokens) seen = seen || t == token;
    if (!seen) tokens.push_back(token);
  }
  // Counts of at least 2 atoms each, summing to 20.
  std::vector<int> counts(kinds, 2);
  for (int left = kAtomsPerCell - 2 * kinds; left > 0; --left) ++counts[Below(rng, kinds)];

  train::CleanCell cell;
  cell.conditions.composition.assign(vocabulary, 0.0);
  for (int k = 0; k < kinds; ++k) {
    for (int i = 0; i < counts[k]; ++i) cell.tokens.push_back(tokens[k]);
    cell.conditions.composition[tokens[k]] = double(counts[k]) / kAtomsPerCell;
  }
  for (int i = 0; i < kAtomsPerCell; ++i) {
    cell.frac.emplace_back(Uniform(rng), Uniform(rng), Uniform(rng));
  }
  const double edge = std::cbrt(kAtomsPerCell * (11 + 8 * Uniform(rng)));
  const auto length = [&] { return edge * (0.85 + 0.3 * Uniform(rng)); };
  const auto angle = [&] { return 80 + 20 * Uniform(rng); };
  structure::LatticeParameters parameters;
  parameters.a = length();
  parameters.b = length();
  parameters.c = length();
  parameters.alpha = angle();
  parameters.beta = angle();
  parameters.gamma = angle();
  const Eigen::Matrix3d lattice = structure::MatrixFromParameters(parameters);
  cell.features = statistics.Standardise(model::LatticeToFeatures(lattice, kAtomsPerCell));
  if (arch.condition_crystal_system) cell.conditions.crystal_system = 1 + index % 7;
  if (arch.condition_space_group) cell.conditions.space_group = 1 + (7 * index) % 230;
  // Standardised property values within one standard deviation of the training mean.
  for (std::size_t p = 0; p < arch.properties.size(); ++p) {
    cell.conditions.properties.push_back(2 * Uniform(rng) - 1);
  }
  return cell;
}

// The network's input and the loss targets for noised[begin, end), laid out as the trainer lays
// out a micro-batch (core/train/trainer.cc, Prepare).
void Layout(const model::Architecture& arch, const std::vector<train::NoisedCell>& noised,
            std::size_t begin, std::size_t end, model::GraphBatch<float>* batch,
            train::BatchTargets<float>* targets) {
  const std::vector<train::NoisedCell> part(noised.begin() + begin, noised.begin() + end);
  std::vector<model::NoisyCell> inputs;
  for (const train::NoisedCell& n : part) inputs.push_back(n.input);
  *batch = model::BuildGraphBatch<float>(arch, inputs);
  *targets = train::StackTargets(part);
}

// The coordinate draws NoiseCell made for `clean`, replayed from the same Philox stream (same key,
// counter and order, core/train/noising.cc), and checked against the noisy coordinates it
// produced, so the dumped draws cannot silently drift from what training does.
void ReplayCoordinateNoise(const train::CleanCell& clean, const train::NoisedCell& noised,
                           double sigma, std::uint32_t item, int first_atom,
                           Eigen::Matrix<double, Eigen::Dynamic, 3, Eigen::RowMajor>* out) {
  random::RandomStream stream(kSeed, item, 0, random::Purpose::kCoordinateNoise);
  for (std::size_t i = 0; i < clean.frac.size(); ++i) {
    for (int k = 0; k < 3; ++k) {
      const double displacement = sigma * stream.Normal();
      if (structure::WrapFraction(clean.frac[i][k] + displacement) != noised.input.frac[i][k]) {
        throw Internal("cells[" + std::to_string(item) + "].frac[" + std::to_string(i) +
                       "]: the replayed coordinate noise does not reproduce train::NoiseCell's");
      }
      (*out)(first_atom + static_cast<int>(i), k) = displacement;
    }
  }
}

}  // namespace

SideBySideBatch BuildSideBySideBatch(const model::ModelBundle& bundle) {
  const model::Architecture& arch = bundle.architecture;
  if (arch.elements.size() < 3) {
    throw InvalidArgument("architecture.elements",
                          "the benchmark invents compositions of up to 3 elements; the model "
                          "knows " + std::to_string(arch.elements.size()));
  }
  model::LatticeStatistics statistics;
  for (int k = 0; k < 6; ++k) {
    statistics.mean[k] = bundle.normalisation.lattice_mean[k];
    statistics.std[k] = bundle.normalisation.lattice_std[k];
  }
  const model::DiffusionProcess process(bundle.schedules, arch);
  std::mt19937_64 rng(kSeed);
  SideBySideBatch out;
  out.coordinate_displacement.resize(kBatchCells * kAtomsPerCell, 3);
  for (int c = 0; c < kBatchCells; ++c) {
    out.clean.push_back(InventCell(arch, statistics, c, &rng));
    const auto item = static_cast<std::uint32_t>(c);
    // Default condition dropout, step 0 of a run seeded kSeed: the draws a training step makes.
    out.noised.push_back(train::NoiseCell(out.clean.back(), process, statistics, arch,
                                          train::ConditionDropout{}, kSeed, item, 0));
    out.sigma.push_back(process.sigma(out.noised.back().t));
    ReplayCoordinateNoise(out.clean.back(), out.noised.back(), out.sigma.back(), item,
                          c * kAtomsPerCell, &out.coordinate_displacement);
  }
  Layout(arch, out.noised, 0, kBatchCells, &out.whole, &out.whole_targets);
  for (int first = 0; first < kBatchCells; first += kMicroBatchCells) {
    out.micro.emplace_back();
    out.micro_targets.emplace_back();
    Layout(arch, out.noised, first, first + kMicroBatchCells, &out.micro.back(),
           &out.micro_targets.back());
  }
  return out;
}

}  // namespace nucleate::bench
