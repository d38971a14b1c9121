#include "core/train/noising.h"

#include <cmath>
#include <limits>

#include "core/random/random_stream.h"
#include "core/schedule/wrapped_normal.h"
#include "core/structure/lattice.h"

namespace nucleate::train {
namespace {

using random::Purpose;
using random::RandomStream;

void DropConditions(const ConditionDropout& dropout, RandomStream* stream,
                    model::CellConditions* k) {
  const bool all = stream->Uniform() < dropout.all;
  // Draw every coin whatever happens, so the stream's use does not depend on the outcome.
  const bool composition = stream->Uniform() < dropout.each;
  const bool system = stream->Uniform() < dropout.each;
  const bool group = stream->Uniform() < dropout.each;
  if (all || composition) k->composition.clear();
  if (all || system) k->crystal_system = 0;
  if (all || group) k->space_group = 0;
  for (double& p : k->properties) {
    if (stream->Uniform() < dropout.each || all) p = std::numeric_limits<double>::quiet_NaN();
  }
}

}  // namespace

NoisedCell NoiseCell(const CleanCell& cell, const model::DiffusionProcess& process,
                     const model::LatticeStatistics& statistics, const model::Architecture& arch,
                     const ConditionDropout& dropout, std::uint32_t seed, std::uint32_t item,
                     std::uint32_t step, long long fixed_t) {
  NoisedCell out;
  const int n = static_cast<int>(cell.frac.size());
  const long long steps = process.steps();
  out.t = fixed_t > 0 ? fixed_t
                      : 1 + static_cast<long long>(
                                RandomStream(seed, item, step, Purpose::kTime).Below(
                                    static_cast<std::uint32_t>(steps)));
  const long long t = out.t;
  out.input.time = static_cast<double>(t) / static_cast<double>(steps);

  // Coordinates: f_t = wrap(f_0 + sigma eps); the target is the wrapped-normal score of the
  // displacement, divided by its scale at this sigma and made mean-free (a common translation
  // carries no information).
  const double sigma = process.sigma(t);
  const int images = process.images(t);
  const double scale = process.score_scale(t);
  RandomStream coordinates(seed, item, step, Purpose::kCoordinateNoise);
  out.input.frac.resize(n);
  out.coordinate_target.resize(n, 3);
  for (int i = 0; i < n; ++i) {
    for (int k = 0; k < 3; ++k) {
      const double displacement = sigma * coordinates.Normal();
      out.input.frac[i][k] = structure::WrapFraction(cell.frac[i][k] + displacement);
      out.coordinate_target(i, k) =
          schedule::WrappedNormalScore(displacement, sigma, images) / scale;
    }
  }
  const Eigen::RowVector3d mean = out.coordinate_target.colwise().mean();
  out.coordinate_target.rowwise() -= mean;

  // Lattice: variance-preserving noise on the standardised features; the network sees the noisy
  // features and the cell they stand for.
  const auto& level = process.lattice(t);
  RandomStream lattice(seed, item, step, Purpose::kLatticeNoise);
  model::LatticeFeatures noisy;
  for (int k = 0; k < 6; ++k) {
    out.lattice_target[k] = lattice.Normal();
    noisy[k] = level.sqrt_alpha_bar * cell.features[k] +
               level.sqrt_one_minus_alpha_bar * out.lattice_target[k];
    out.input.lattice_features[k] = noisy[k];
  }
  out.input.lattice = model::FeaturesToLattice(statistics.Unstandardise(noisy), n);

  // Species: absorbing masks each atom with probability 1 - alpha_bar_t; masked atoms are the
  // ones whose clean species the network must predict.
  out.input.tokens = cell.tokens;
  out.species_target.assign(n, -1);
  if (arch.species_mode == model::SpeciesMode::kAbsorbing) {
    RandomStream mask(seed, item, step, Purpose::kSpeciesMask);
    const double keep = process.species_kept(t);
    for (int i = 0; i < n; ++i) {
      if (mask.Uniform() >= keep) {
        out.species_target[i] = cell.tokens[i];
        out.input.tokens[i] = arch.mask_token();
      }
    }
  }

  out.input.conditions = cell.conditions;
  RandomStream drop(seed, item, step, Purpose::kConditionDropout);
  DropConditions(dropout, &drop, &out.input.conditions);
  return out;
}

BatchTargets<float> StackTargets(const std::vector<NoisedCell>& noised) {
  int atoms = 0;
  for (const NoisedCell& n : noised) atoms += static_cast<int>(n.coordinate_target.rows());
  BatchTargets<float> targets;
  targets.coordinate_score.resize(atoms, 3);
  targets.lattice_noise.resize(static_cast<int>(noised.size()), 6);
  targets.species.reserve(static_cast<std::size_t>(atoms));
  int atom = 0;
  for (std::size_t c = 0; c < noised.size(); ++c) {
    const NoisedCell& n = noised[c];
    for (int i = 0; i < n.coordinate_target.rows(); ++i, ++atom) {
      for (int k = 0; k < 3; ++k) targets.coordinate_score(atom, k) = float(n.coordinate_target(i, k));
      targets.species.push_back(n.species_target[i]);
    }
    for (int k = 0; k < 6; ++k) targets.lattice_noise(static_cast<int>(c), k) = float(n.lattice_target[k]);
  }
  return targets;
}

}  // namespace nucleate::train
