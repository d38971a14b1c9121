#include "core/match/prepared_crystal.h"

#include <algorithm>
#include <cmath>
#include <numeric>

#include "core/match/lattice_points.h"
#include "core/match/primitive_cell.h"
#include "core/structure/lattice.h"
#include "core/structure/validate.h"

namespace nucleate::match {

PreparedCrystal Prepare(const structure::Crystal& crystal, const MatchTolerances& tolerances) {
  ValidateTolerances(tolerances);
  structure::ValidateCrystal(crystal, structure::StructureLimits{});
  const structure::Crystal cell =
      tolerances.primitive_cell ? PrimitiveCell(crystal, tolerances.primitive_tolerance) : crystal;

  PreparedCrystal p;
  Eigen::Matrix3i transform;
  p.lattice = ShortestBasis(cell.lattice, &transform);
  // Rows: new = transform * old, so frac_new = transform^-T frac_old (exact integer inverse).
  const Eigen::Matrix3d frac_map = transform.cast<double>().inverse().transpose();

  const std::size_t n = cell.size();
  std::vector<std::size_t> order(n);
  std::iota(order.begin(), order.end(), 0);
  std::stable_sort(order.begin(), order.end(),
                   [&](std::size_t x, std::size_t y) { return cell.numbers[x] < cell.numbers[y]; });
  for (std::size_t i : order) {
    p.numbers.push_back(cell.numbers[i]);
    p.frac.push_back(structure::WrapFractional(frac_map * cell.frac[i]));
  }
  for (std::size_t i = 0; i < n;) {
    std::size_t j = i;
    while (j < n && p.numbers[j] == p.numbers[i]) ++j;
    p.blocks.emplace_back(static_cast<int>(i), static_cast<int>(j));
    p.block_numbers.push_back(p.numbers[i]);
    i = j;
  }
  int g = 0;
  for (const auto& [b, e] : p.blocks) g = std::gcd(g, e - b);
  for (std::size_t k = 0; k < p.blocks.size(); ++k) {
    p.reduced_counts.push_back((p.blocks[k].second - p.blocks[k].first) / g);
    if (k) p.formula += ' ';
    p.formula += std::to_string(p.block_numbers[k]) + ':' + std::to_string(p.reduced_counts[k]);
  }

  p.volume = std::abs(p.lattice.determinant());
  if (tolerances.scale_volume) {
    // One cubic length unit per atom: both structures of a pair then share the volume per atom,
    // and normalised distances are plain distances.
    p.scale = std::cbrt(static_cast<double>(n) / p.volume);
    p.lattice *= p.scale;
    p.volume = std::abs(p.lattice.determinant());
  }
  return p;
}

}  // namespace nucleate::match
