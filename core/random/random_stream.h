// Counter-based random numbers: Philox4x32-10 (Salmon et al. 2011, from Debian's Random123).
// Key = (seed, item index); counter = (draw, step, purpose, 0). Every number a training cell or a
// sample uses depends only on these, never on batch size, thread count or process split
// (core/model/DESIGN.md, "Randomness"). Streams are cheap values: make one where it is needed.
#pragma once

#include <array>
#include <cstdint>

namespace nucleate::random {

// Separate purposes never share a counter, so adding a new purpose never changes existing draws.
// Values are stored in bundles and checkpoints only through their effect: never renumber.
enum class Purpose : std::uint32_t {
  kInitialise = 1,      // parameter initialisation
  kShuffle = 2,         // epoch order of the training set
  kTime = 3,            // time step drawn for a training cell
  kCoordinateNoise = 4,
  kLatticeNoise = 5,
  kSpeciesMask = 6,
  kConditionDropout = 7,
  kSampleAtomCount = 8,  // sampling: the number of atoms
  kSamplePrior = 9,      // sampling: initial noise
  kSampleStep = 10,      // sampling: noise injected at each step
  kSampleSpecies = 11,   // sampling: species draws
  kSampleCorrector = 12,   // sampling: noise of Langevin corrector steps
  kSampleConstraint = 13,  // sampling: noise of the known parts (replacement at every level)
};

class RandomStream {
 public:
  RandomStream(std::uint32_t seed, std::uint32_t item, std::uint32_t step, Purpose purpose);

  // Next 32 random bits (four per Philox block; the draw counter advances per block).
  std::uint32_t NextWord();
  // Uniform on [0, 1) with 53 random bits (two words).
  double Uniform();
  // Uniform on (0, 1]: safe to take the logarithm of.
  double UniformOpenZero();
  // Standard normal, Box-Muller on two uniforms (both values are used in turn).
  double Normal();
  // Uniform integer in [0, n), n > 0, without modulo bias (rejection).
  std::uint32_t Below(std::uint32_t n);

 private:
  void Refill();

  std::array<std::uint32_t, 2> key_;
  std::array<std::uint32_t, 4> counter_;
  std::array<std::uint32_t, 4> block_{};
  int used_ = 4;
  bool has_spare_normal_ = false;
  double spare_normal_ = 0;
};

}  // namespace nucleate::random
