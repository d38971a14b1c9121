// Train / validation / test split by composition: all structures of one reduced formula land in
// the same split, so a validation score never rewards remembering a composition seen in training.
#pragma once

#include <cstdint>
#include <string>
#include <string_view>
#include <vector>

#include "core/train/data/training_example.h"

namespace nucleate::train::data {

struct DatasetSplit {
  std::vector<std::size_t> train;       // indices into the examples, ascending
  std::vector<std::size_t> validation;
  std::vector<std::size_t> test;
};

// FNV-1a, 64 bits (Fowler, Noll, Vo; IETF draft-eastlake-fnv): offset basis
// 14695981039346656037, prime 1099511628211.
std::uint64_t Fnv1a64(std::string_view bytes);

// A number in [0, 1) fixed by the formula and the seed alone: FNV-1a 64 (Fowler, Noll, Vo; IETF
// draft-eastlake-fnv) over the formula's bytes, a zero byte and the seed's 8 bytes (little
// endian), then the SplitMix64 finaliser (Steele, Lea, Flood 2014), whose avalanche FNV-1a lacks
// in its high bits for short inputs differing in the last bytes; the top 53 bits give the
// fraction. A plain hash, not core/random's Philox: the split must not move if the random stream
// design ever changes, and it needs no counter.
double FormulaSplitDraw(const std::string& formula, std::uint64_t seed);

// A formula goes to validation when its draw is below validation_fraction, to test when below
// validation_fraction + test_fraction, else to train. Each formula's split depends only on the
// formula and the seed, never on which other structures are in the set, so a data set that grows
// keeps every old formula where it was. The fractions are met in expectation over formulas; the
// achieved fractions of examples scatter around them by about sqrt(f (1 - f) sum n_i^2) / sum n_i
// (n_i: examples per formula), so a set with few formulas can miss them widely.
// InvalidArgument("validation_fraction") / ("test_fraction") for a value outside [0, 1) or a
// sum >= 1.
DatasetSplit SplitByComposition(const std::vector<TrainingExample>& examples,
                                double validation_fraction, double test_fraction,
                                std::uint64_t seed);

}  // namespace nucleate::train::data
