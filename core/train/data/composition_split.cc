#include "core/train/data/composition_split.h"

#include <cmath>

#include "core/common/error.h"

namespace nucleate::train::data {
namespace {

std::uint64_t SplitMix64Finalise(std::uint64_t z) {
  z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9ULL;
  z = (z ^ (z >> 27)) * 0x94D049BB133111EBULL;
  return z ^ (z >> 31);
}

void CheckFraction(const char* field, double value) {
  if (!std::isfinite(value) || value < 0.0 || value >= 1.0) {
    throw InvalidArgument(field, "must lie in [0, 1)");
  }
}

}  // namespace

std::uint64_t Fnv1a64(std::string_view bytes) {
  std::uint64_t hash = 14695981039346656037ULL;
  for (char c : bytes) hash = (hash ^ static_cast<unsigned char>(c)) * 1099511628211ULL;
  return hash;
}

double FormulaSplitDraw(const std::string& formula, std::uint64_t seed) {
  // The zero byte ends the formula, so ("AB", seed) and ("A", seed') never hash the same bytes.
  std::string bytes = formula;
  bytes.push_back('\0');
  for (int k = 0; k < 8; ++k) bytes.push_back(static_cast<char>((seed >> (8 * k)) & 0xFF));
  return static_cast<double>(SplitMix64Finalise(Fnv1a64(bytes)) >> 11) * 0x1.0p-53;
}

DatasetSplit SplitByComposition(const std::vector<TrainingExample>& examples,
                                double validation_fraction, double test_fraction,
                                std::uint64_t seed) {
  CheckFraction("validation_fraction", validation_fraction);
  CheckFraction("test_fraction", test_fraction);
  if (!(validation_fraction + test_fraction < 1.0)) {
    throw InvalidArgument("test_fraction",
                          "validation_fraction + test_fraction must be below 1 (no training data)");
  }
  DatasetSplit split;
  for (std::size_t i = 0; i < examples.size(); ++i) {
    const double draw = FormulaSplitDraw(examples[i].formula, seed);
    if (draw < validation_fraction) {
      split.validation.push_back(i);
    } else if (draw < validation_fraction + test_fraction) {
      split.test.push_back(i);
    } else {
      split.train.push_back(i);
    }
  }
  return split;
}

}  // namespace nucleate::train::data
