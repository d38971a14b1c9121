#include "core/train/data/structure_message.h"

#include <cmath>
#include <string>

#include "core/common/error.h"
#include "core/structure/lattice.h"

namespace nucleate::train::data {

structure::Crystal CrystalFromMessage(const v1::Structure& message,
                                      const structure::StructureLimits& limits) {
  const int n = message.atomic_numbers_size();
  if (n > limits.max_atoms) {
    throw LimitExceeded("atomic_numbers", std::to_string(n) +
                                              " atoms is above limits.max_atoms = " +
                                              std::to_string(limits.max_atoms));
  }
  if (message.lattice_size() != 9) {
    throw InvalidArgument("lattice", "needs 9 numbers (rows a, b, c), got " +
                                         std::to_string(message.lattice_size()));
  }
  if (message.frac_coords_size() != 3 * n) {
    throw InvalidArgument("frac_coords", "needs 3 numbers per atom (" + std::to_string(3 * n) +
                                             "), got " +
                                             std::to_string(message.frac_coords_size()));
  }
  structure::Crystal crystal;
  for (int k = 0; k < 9; ++k) crystal.lattice(k / 3, k % 3) = message.lattice(k);
  crystal.numbers.assign(message.atomic_numbers().begin(), message.atomic_numbers().end());
  crystal.frac.resize(static_cast<std::size_t>(n));
  for (int i = 0; i < n; ++i) {
    for (int k = 0; k < 3; ++k) {
      const double x = message.frac_coords(3 * i + k);
      crystal.frac[static_cast<std::size_t>(i)][k] =
          std::isfinite(x) ? structure::WrapFraction(x) : x;
    }
  }
  crystal.label = message.label();
  crystal.properties.insert(message.properties().begin(), message.properties().end());
  return crystal;
}

}  // namespace nucleate::train::data
