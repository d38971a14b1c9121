// A digest of the training data, stored in the model bundle's provenance: two runs with the same
// hash trained on the same cells, whatever their files were called on disk or read in which order.
#pragma once

#include <string>
#include <vector>

#include "core/train/data/training_example.h"

namespace nucleate::train::data {

// SHA-256 (core/common/sha256.h), as 64 lowercase hex digits, of a canonical byte encoding:
//   "nucleate-training-data-v1" and a zero byte;
//   the number of training examples;
//   each example of `train`, ordered by source (byte order), ties by index: source, formula
//   (length + bytes), crystal_system, space_group, atom count, the 9 lattice numbers row-major,
//   per atom its atomic number and 3 fractional coordinates, then the number of property values
//   and the values.
// Integers are 8-byte little endian; doubles are their IEEE 754 binary64 bits, little endian,
// with every NaN written as the one quiet NaN 0x7ff8000000000000 (missing values carry no
// payload). The cells are the Niggli-reduced ones training sees, so a change in the reduction
// changes the hash, as it should. Property names are not hashed: they belong to the model's
// architecture, which the bundle stores beside the hash; their values are.
// InvalidArgument("train[k]") for an index outside `examples`, ("examples[i].crystal.frac") when
// a cell has not one coordinate triple per atom.
std::string DatasetHash(const std::vector<TrainingExample>& examples,
                        const std::vector<std::size_t>& train);

}  // namespace nucleate::train::data
