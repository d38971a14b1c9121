#include "core/model/graph_batch.h"

#include <algorithm>
#include <cmath>
#include <numeric>
#include <string>

#include "core/common/error.h"
#include "core/structure/crystal.h"
#include "core/structure/neighbor_list.h"
#include "core/structure/periodic_distances.h"

namespace nucleate::model {
namespace {

constexpr double kTwoPi = 6.283185307179586;

struct Edge {
  int receiver, sender;
  Eigen::Vector3d delta;  // frac[sender] - frac[receiver]
  double distance;        // angstrom
};

std::string CellField(std::size_t c) { return "cells[" + std::to_string(c) + "]"; }

void CheckCell(const Architecture& a, const NoisyCell& cell, std::size_t c) {
  const std::string field = CellField(c);
  if (cell.frac.empty()) throw InvalidArgument(field + ".frac", "a cell needs at least one atom");
  if (cell.tokens.size() != cell.frac.size()) {
    throw InvalidArgument(field + ".tokens", "has " + std::to_string(cell.tokens.size()) +
                                                 " entries for " + std::to_string(cell.frac.size()) +
                                                 " atoms");
  }
  for (std::size_t i = 0; i < cell.tokens.size(); ++i) {
    if (cell.tokens[i] < 0 || cell.tokens[i] >= a.species_tokens()) {
      throw InvalidArgument(field + ".tokens[" + std::to_string(i) + "]",
                            "token " + std::to_string(cell.tokens[i]) + " outside 0.." +
                                std::to_string(a.species_tokens() - 1));
    }
    if (!cell.frac[i].allFinite()) {
      throw InvalidArgument(field + ".frac[" + std::to_string(i) + "]", "not finite");
    }
  }
  for (double f : cell.lattice_features) {
    if (!std::isfinite(f)) throw InvalidArgument(field + ".lattice_features", "not finite");
  }
  if (!(cell.time > 0 && cell.time <= 1)) {
    throw InvalidArgument(field + ".time", "must lie in (0, 1]");
  }
  const CellConditions& k = cell.conditions;
  if (!k.composition.empty() && k.composition.size() != a.elements.size()) {
    throw InvalidArgument(field + ".conditions.composition",
                          "has " + std::to_string(k.composition.size()) + " entries for " +
                              std::to_string(a.elements.size()) + " vocabulary elements");
  }
  if (k.crystal_system < 0 || k.crystal_system > 7) {
    throw InvalidArgument(field + ".conditions.crystal_system", "must be 0 (missing) or 1..7");
  }
  if (k.space_group < 0 || k.space_group > 230) {
    throw InvalidArgument(field + ".conditions.space_group", "must be 0 (missing) or 1..230");
  }
  if (!k.properties.empty() && k.properties.size() != a.properties.size()) {
    throw InvalidArgument(field + ".conditions.properties",
                          "has " + std::to_string(k.properties.size()) + " values for " +
                              std::to_string(a.properties.size()) + " model properties");
  }
}

// Every ordered pair, the minimum image giving the distance (cells below the cutoff size).
void AllPairs(const NoisyCell& cell, int base, std::vector<Edge>* out) {
  const structure::MinimumImage image(cell.lattice);
  const int n = static_cast<int>(cell.frac.size());
  for (int i = 0; i < n; ++i) {
    for (int j = 0; j < n; ++j) {
      if (i == j) continue;
      const double d = image.Between(cell.frac[i], cell.frac[j]).distance;
      out->push_back({base + i, base + j, cell.frac[j] - cell.frac[i], d});
    }
  }
}

// Every periodic neighbour within the cutoff, each image its own edge (large cells).
void CutoffNeighbours(const NoisyCell& cell, double cutoff, int base, std::vector<Edge>* out) {
  structure::Crystal crystal;
  crystal.lattice = cell.lattice;
  crystal.frac = cell.frac;
  for (auto& f : crystal.frac) f = f.array() - f.array().floor();  // the search wants [0, 1)
  crystal.numbers.assign(cell.frac.size(), 1);  // species play no part in geometry
  structure::StructureLimits limits;
  limits.max_atoms = std::max<std::int64_t>(limits.max_atoms, crystal.size());
  const std::size_t first = out->size();
  structure::VisitNeighbors(
      crystal, cutoff,
      [&](const structure::Neighbor& n) {
        out->push_back({base + static_cast<int>(n.i), base + static_cast<int>(n.j),
                        cell.frac[n.j] - cell.frac[n.i], n.distance});
      },
      limits);
  // Receivers in order (a contiguous segment per atom), senders next, for a fixed sum order.
  std::stable_sort(out->begin() + first, out->end(), [](const Edge& x, const Edge& y) {
    return x.receiver != y.receiver ? x.receiver < y.receiver : x.sender < y.sender;
  });
}

template <typename T>
void FillEdgeGeometry(const Architecture& a, const Edge& e, double unit, T* row) {
  int k = 0;
  for (int axis = 0; axis < 3; ++axis) {
    for (int f = 1; f <= a.fourier_frequencies; ++f) {
      const double phase = kTwoPi * f * e.delta[axis];
      row[k++] = static_cast<T>(std::sin(phase));
      row[k++] = static_cast<T>(std::cos(phase));
    }
  }
  const double x = e.distance / unit;
  const int r = a.radial_basis;
  const double spacing = r > 1 ? a.radial_max / (r - 1) : a.radial_max;
  for (int b = 0; b < r; ++b) {
    const double z = (x - spacing * b) / spacing;
    row[k++] = static_cast<T>(std::exp(-0.5 * z * z));
  }
}

}  // namespace

void TimeEmbedding(double u, int width, double* out) {
  const int half = width / 2;
  for (int k = 0; k < half; ++k) {
    const double frequency = std::pow(10000.0, -static_cast<double>(k) / half);
    out[k] = std::sin(1000.0 * u * frequency);
    out[half + k] = std::cos(1000.0 * u * frequency);
  }
}

template <typename T>
GraphBatch<T> BuildGraphBatch(const Architecture& a, const std::vector<NoisyCell>& cells) {
  GraphBatch<T> b;
  b.cells = static_cast<int>(cells.size());
  b.atom_offsets.assign(1, 0);
  const int elements = static_cast<int>(a.elements.size());
  const int properties = static_cast<int>(a.properties.size());
  const int cell_width = a.time_embedding + 6;
  b.cell_inputs.setZero(b.cells, cell_width);
  b.composition.setZero(b.cells, elements);
  b.composition_present.setZero(b.cells, 1);
  b.properties.setZero(b.cells, properties);
  b.properties_present.setZero(b.cells, properties);
  b.crystal_system.assign(b.cells, 0);
  b.space_group.assign(b.cells, 0);

  std::vector<Edge> edges;
  std::vector<double> units;  // per cell, (V/N)^(1/3)
  std::vector<double> time_row(a.time_embedding);
  for (std::size_t c = 0; c < cells.size(); ++c) {
    const NoisyCell& cell = cells[c];
    CheckCell(a, cell, c);
    const int base = b.atom_offsets.back();
    const int n = static_cast<int>(cell.frac.size());
    b.atom_offsets.push_back(base + n);
    b.tokens.insert(b.tokens.end(), cell.tokens.begin(), cell.tokens.end());
    const double volume = std::abs(cell.lattice.determinant());
    if (!(volume > 0) || !std::isfinite(volume)) {
      throw InvalidArgument(CellField(c) + ".lattice", "singular or not finite");
    }
    const double unit = std::cbrt(volume / n);
    const std::size_t first_edge = edges.size();
    try {
      if (n < a.cutoff_from_atoms) {
        AllPairs(cell, base, &edges);
      } else {
        CutoffNeighbours(cell, a.cutoff * unit, base, &edges);
      }
    } catch (const Error& e) {
      throw e.WithinField(CellField(c));
    }
    units.insert(units.end(), edges.size() - first_edge, unit);

    TimeEmbedding(cell.time, a.time_embedding, time_row.data());
    for (int k = 0; k < a.time_embedding; ++k) b.cell_inputs(c, k) = static_cast<T>(time_row[k]);
    for (int k = 0; k < 6; ++k) {
      b.cell_inputs(c, a.time_embedding + k) = static_cast<T>(cell.lattice_features[k]);
    }
    const CellConditions& k = cell.conditions;
    if (!k.composition.empty()) {
      b.composition_present(c, 0) = 1;
      for (int e = 0; e < elements; ++e) b.composition(c, e) = static_cast<T>(k.composition[e]);
    }
    b.crystal_system[c] = k.crystal_system;
    b.space_group[c] = k.space_group;
    for (int p = 0; p < static_cast<int>(k.properties.size()); ++p) {
      if (std::isnan(k.properties[p])) continue;
      b.properties(c, p) = static_cast<T>(k.properties[p]);
      b.properties_present(c, p) = 1;
    }
  }

  const int atoms = b.atoms();
  const int count = static_cast<int>(edges.size());
  b.edge_sender.resize(count);
  b.edge_receiver.resize(count);
  b.edge_geometry.resize(count, a.edge_features());
  b.edge_offsets.assign(atoms + 1, 0);
  for (int e = 0; e < count; ++e) {
    b.edge_sender[e] = edges[e].sender;
    b.edge_receiver[e] = edges[e].receiver;
    ++b.edge_offsets[edges[e].receiver + 1];
    FillEdgeGeometry(a, edges[e], units[e], b.edge_geometry.row(e).data());
  }
  std::partial_sum(b.edge_offsets.begin(), b.edge_offsets.end(), b.edge_offsets.begin());
  return b;
}

template GraphBatch<float> BuildGraphBatch<float>(const Architecture&, const std::vector<NoisyCell>&);
template GraphBatch<double> BuildGraphBatch<double>(const Architecture&, const std::vector<NoisyCell>&);

}  // namespace nucleate::model
