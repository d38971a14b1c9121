// Cell lists on the LLL-reduced cell. Along reduced axis k the lattice planes are h_k = 1/|b_k|
// apart (b_k the reciprocal rows), and a point within `cutoff` of another differs from it by at
// most cutoff * |b_k| in fractional coordinate k. With n_k bins of width 1/n_k along k, a pair
// within the cutoff therefore lies at most ceil(cutoff * |b_k| * n_k) bins apart; bins past the
// cell edge are the periodic images of the bins inside it. That holds for any bin count, so
// capping the bins (to bound memory in a huge cell) or a cell smaller than the cutoff (several
// images) stays exact.
#include "core/structure/neighbor_list.h"

#include <algorithm>
#include <cmath>
#include <string>

#include "core/common/error.h"
#include "core/elements/elements.h"
#include "core/structure/lattice.h"
#include "core/structure/lattice_reduction.h"
#include "core/structure/validate.h"

namespace nucleate::structure {
namespace {

// Rounding in bin assignment and in the reach must never lose a pair at the cutoff.
constexpr double kReachSlack = 1e-9;

struct CellLists {
  Eigen::Matrix3d lattice;                // reduced
  Eigen::Matrix3i transform;              // reduced = transform * original
  std::vector<Eigen::Vector3d> position;  // Cartesian, inside the reduced home cell
  std::vector<Eigen::Vector3i> shift;     // reduced fractional = wrapped + shift
  int bins[3] = {1, 1, 1};
  int reach[3] = {0, 0, 0};
  std::vector<int> bin_of_site;
  std::vector<std::size_t> bin_start;     // sites of bin b: order[bin_start[b] .. bin_start[b+1])
  std::vector<std::size_t> order;
};

void RequireCutoff(double cutoff, const char* field) {
  if (!std::isfinite(cutoff) || cutoff <= 0) {
    throw InvalidArgument(field, "must be a positive finite distance in angstrom");
  }
}

CellLists BuildCellLists(const Crystal& crystal, double cutoff) {
  CellLists cl;
  const ReducedLattice reduced = ReduceLattice(crystal.lattice);
  cl.lattice = reduced.lattice;
  cl.transform = reduced.transform;
  const Eigen::Matrix3d to_reduced = reduced.inverse.transpose().cast<double>();
  const Eigen::Vector3d recip_norms = ReciprocalLattice(cl.lattice).rowwise().norm();

  const std::size_t n = crystal.size();
  // At most about two bins per site (and 27 for tiny cells): a huge cell with a small cutoff must
  // not allocate a bin per cubic angstrom.
  const double max_bins = std::max<double>(27.0, 2.0 * static_cast<double>(n));
  for (int k = 0; k < 3; ++k) {
    cl.bins[k] = static_cast<int>(std::max(1.0, std::min(1e6, std::floor(1.0 / (recip_norms[k] * cutoff)))));
  }
  while (static_cast<double>(cl.bins[0]) * cl.bins[1] * cl.bins[2] > max_bins) {
    int* largest = std::max_element(cl.bins, cl.bins + 3);
    *largest = (*largest + 1) / 2;
  }
  for (int k = 0; k < 3; ++k) {
    cl.reach[k] = static_cast<int>(std::ceil(cutoff * recip_norms[k] * cl.bins[k] + kReachSlack));
  }

  cl.position.resize(n);
  cl.shift.resize(n);
  cl.bin_of_site.resize(n);
  const int total_bins = cl.bins[0] * cl.bins[1] * cl.bins[2];
  std::vector<std::size_t> count(total_bins + 1, 0);
  for (std::size_t s = 0; s < n; ++s) {
    const Eigen::Vector3d g = to_reduced * crystal.frac[s];
    Eigen::Vector3d w;
    int b[3];
    for (int k = 0; k < 3; ++k) {
      w[k] = WrapFraction(g[k]);
      cl.shift[s][k] = static_cast<int>(std::llround(g[k] - w[k]));
      b[k] = std::min(static_cast<int>(w[k] * cl.bins[k]), cl.bins[k] - 1);
    }
    cl.position[s] = cl.lattice.transpose() * w;
    cl.bin_of_site[s] = (b[0] * cl.bins[1] + b[1]) * cl.bins[2] + b[2];
    ++count[cl.bin_of_site[s] + 1];
  }
  cl.bin_start.assign(total_bins + 1, 0);
  for (int b = 0; b < total_bins; ++b) cl.bin_start[b + 1] = cl.bin_start[b] + count[b + 1];
  cl.order.resize(n);
  std::vector<std::size_t> fill(cl.bin_start.begin(), cl.bin_start.end() - 1);
  for (std::size_t s = 0; s < n; ++s) cl.order[fill[cl.bin_of_site[s]]++] = s;
  return cl;
}

int FloorDiv(int a, int b) { return a >= 0 ? a / b : -((-a + b - 1) / b); }

template <typename Visit>
void ForEachPair(const Crystal& crystal, double cutoff, Visit&& visit) {
  const CellLists cl = BuildCellLists(crystal, cutoff);
  const double cutoff2 = cutoff * cutoff;
  const Eigen::Matrix3i transform_t = cl.transform.transpose();
  Neighbor nb;
  for (std::size_t i = 0; i < crystal.size(); ++i) {
    const int bi = cl.bin_of_site[i];
    const int home[3] = {bi / (cl.bins[1] * cl.bins[2]), (bi / cl.bins[2]) % cl.bins[1], bi % cl.bins[2]};
    for (int o0 = -cl.reach[0]; o0 <= cl.reach[0]; ++o0) {
      const int t0 = home[0] + o0, w0 = FloorDiv(t0, cl.bins[0]), b0 = t0 - w0 * cl.bins[0];
      for (int o1 = -cl.reach[1]; o1 <= cl.reach[1]; ++o1) {
        const int t1 = home[1] + o1, w1 = FloorDiv(t1, cl.bins[1]), b1 = t1 - w1 * cl.bins[1];
        for (int o2 = -cl.reach[2]; o2 <= cl.reach[2]; ++o2) {
          const int t2 = home[2] + o2, w2 = FloorDiv(t2, cl.bins[2]), b2 = t2 - w2 * cl.bins[2];
          const Eigen::Vector3i w(w0, w1, w2);
          const Eigen::Vector3d translation = cl.lattice.transpose() * w.cast<double>();
          const int bin = (b0 * cl.bins[1] + b1) * cl.bins[2] + b2;
          for (std::size_t q = cl.bin_start[bin]; q < cl.bin_start[bin + 1]; ++q) {
            const std::size_t j = cl.order[q];
            if (j == i && w.isZero()) continue;
            const Eigen::Vector3d v = cl.position[j] + translation - cl.position[i];
            const double d2 = v.squaredNorm();
            if (d2 > cutoff2) continue;
            nb.i = i;
            nb.j = j;
            // Reduced offset of j's image relative to i's unwrapped position, then the caller's basis.
            nb.image = transform_t * (w - cl.shift[j] + cl.shift[i]);
            nb.distance = std::sqrt(d2);
            visit(nb);
          }
        }
      }
    }
  }
}

double CovalentRadius(int z, std::size_t site) {
  const elements::Element* e = elements::FindElement(z);
  if (e == nullptr || !std::isfinite(e->covalent_radius)) {
    throw InvalidArgument("atomic_numbers[" + std::to_string(site) + "]",
                          "no covalent radius is tabulated for atomic number " + std::to_string(z));
  }
  return e->covalent_radius;
}

}  // namespace

void VisitNeighbors(const Crystal& crystal, double cutoff,
                    const std::function<void(const Neighbor&)>& visit,
                    const StructureLimits& limits) {
  RequireCutoff(cutoff, "cutoff");
  ValidateCrystal(crystal, limits);
  ForEachPair(crystal, cutoff, visit);
}

std::vector<Neighbor> NeighborList(const Crystal& crystal, double cutoff,
                                   const StructureLimits& limits) {
  RequireCutoff(cutoff, "cutoff");
  ValidateCrystal(crystal, limits);
  // Refuse before building when a uniform density would already exceed the cap.
  const double n = static_cast<double>(crystal.size());
  const double volume = std::fabs(crystal.lattice.determinant());
  const double expected = n * n / volume * (4.0 / 3.0) * 3.14159265358979323846 * cutoff * cutoff * cutoff;
  auto too_many = [&](double pairs) {
    return LimitExceeded("cutoff", "about " + std::to_string(static_cast<long long>(pairs)) +
                                       " neighbour pairs, above the limit of " +
                                       std::to_string(kMaxNeighborPairs) + ": lower the cutoff");
  };
  if (expected > static_cast<double>(kMaxNeighborPairs)) throw too_many(expected);
  std::vector<Neighbor> list;
  ForEachPair(crystal, cutoff, [&](const Neighbor& nb) {
    if (static_cast<std::int64_t>(list.size()) >= kMaxNeighborPairs) throw too_many(list.size() + 1.0);
    list.push_back(nb);
  });
  return list;
}

std::vector<int> CoordinationNumbers(const Crystal& crystal, double cutoff,
                                     const StructureLimits& limits) {
  RequireCutoff(cutoff, "cutoff");
  ValidateCrystal(crystal, limits);
  std::vector<int> cn(crystal.size(), 0);
  ForEachPair(crystal, cutoff, [&](const Neighbor& nb) { ++cn[nb.i]; });
  return cn;
}

std::vector<int> CovalentCoordinationNumbers(const Crystal& crystal, double factor,
                                             const StructureLimits& limits) {
  RequireCutoff(factor, "factor");
  ValidateCrystal(crystal, limits);
  std::vector<double> radius(crystal.size());
  double largest = 0;
  for (std::size_t s = 0; s < crystal.size(); ++s) {
    radius[s] = CovalentRadius(crystal.numbers[s], s);
    largest = std::max(largest, radius[s]);
  }
  std::vector<int> cn(crystal.size(), 0);
  ForEachPair(crystal, factor * 2 * largest, [&](const Neighbor& nb) {
    if (nb.distance <= factor * (radius[nb.i] + radius[nb.j])) ++cn[nb.i];
  });
  return cn;
}

}  // namespace nucleate::structure
