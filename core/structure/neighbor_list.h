// Cutoff neighbour lists and coordination numbers for a periodic crystal, with cell lists over the
// LLL-reduced cell so that a large cell costs O(N) and a tiny or skewed one is still exact (every
// periodic image within the cutoff is visited, an atom's own images included).
#pragma once

#include <cstddef>
#include <cstdint>
#include <functional>
#include <vector>

#include <Eigen/Dense>

#include "core/structure/crystal.h"

namespace nucleate::structure {

// A neighbour list holding more pairs than this is refused (LimitExceeded on "cutoff"): 10 million
// pairs of 40 bytes are 400 MB.
constexpr std::int64_t kMaxNeighborPairs = 10000000;

// One directed neighbour: site j's image `image` lies `distance` from site i.
struct Neighbor {
  std::size_t i = 0, j = 0;
  Eigen::Vector3i image = Eigen::Vector3i::Zero();
  double distance = 0;
};

// Every ordered pair (i, j, image) with distance <= cutoff, both directions listed, an atom's own
// images included, the atom itself (i == j, image 0) excluded. Cell lists over the reduced cell:
// O(N) for a large cell at fixed density and cutoff. Raises InvalidArgument("cutoff") for a cutoff
// that is not positive and finite, LimitExceeded("cutoff") when the list would exceed
// kMaxNeighborPairs.
std::vector<Neighbor> NeighborList(const Crystal& crystal, double cutoff,
                                   const StructureLimits& limits = {});
// The same pairs handed to `visit` one at a time, in the same order, without storing them.
void VisitNeighbors(const Crystal& crystal, double cutoff,
                    const std::function<void(const Neighbor&)>& visit,
                    const StructureLimits& limits = {});

// Neighbours within `cutoff` of each site.
std::vector<int> CoordinationNumbers(const Crystal& crystal, double cutoff,
                                     const StructureLimits& limits = {});
// Neighbours closer than factor * (r_i + r_j), r the covalent radii (Cordero et al. 2008, see
// core/elements/elements.cc). Raises InvalidArgument("atomic_numbers[k]") for an element with no
// tabulated radius (Z > 96) and InvalidArgument("factor") for a factor not positive and finite.
std::vector<int> CovalentCoordinationNumbers(const Crystal& crystal, double factor,
                                             const StructureLimits& limits = {});

}  // namespace nucleate::structure
