// A batch of noisy cells laid out for the network: atoms of all cells stacked, edges of all cells
// stacked (sorted by receiving atom, so a mean over incoming edges is a contiguous segment), edge
// geometry features, per-cell inputs and conditions (core/model/DESIGN.md, "The network").
// Geometry is computed in double and stored in the network's scalar type once.
#pragma once

#include <array>
#include <vector>

#include <Eigen/Dense>

#include "core/model/architecture.h"
#include "core/model/nn/tensor.h"

namespace nucleate::model {

// What is known about a cell besides its atoms; every part may be missing.
struct CellConditions {
  std::vector<double> composition;   // fractions per vocabulary element (sum 1), empty = missing
  int crystal_system = 0;            // 1..7 (triclinic..cubic), 0 = missing
  int space_group = 0;               // 1..230, 0 = missing
  std::vector<double> properties;    // standardised, one per architecture property; NaN = missing
};

// One cell as the network sees it at time t: noisy lattice, coordinates and species tokens.
struct NoisyCell {
  Eigen::Matrix3d lattice = Eigen::Matrix3d::Identity();  // rows; the cell the distances use
  std::array<double, 6> lattice_features{};  // standardised noisy lattice features (the input)
  std::vector<Eigen::Vector3d> frac;         // noisy fractional coordinates
  std::vector<int> tokens;                   // vocabulary index per atom, or the mask token
  double time = 0;                           // t / T in (0, 1]
  CellConditions conditions;
};

template <typename T>
struct GraphBatch {
  int cells = 0;
  std::vector<int> atom_offsets;   // cells + 1: atoms of cell c are atom_offsets[c] .. [c+1]-1
  std::vector<int> tokens;         // per atom
  std::vector<int> edge_sender;    // per edge: the atom whose features travel (j)
  std::vector<int> edge_receiver;  // per edge: the atom that receives (i), non-decreasing
  std::vector<int> edge_offsets;   // atoms + 1: edges received by atom i
  nn::Matrix<T> edge_geometry;     // edges x edge_features(): Fourier then radial features
  nn::Matrix<T> cell_inputs;       // cells x (time_embedding + 6)
  // Conditions as matrices with presence masks (1 present, 0 missing), so "missing" is one more
  // learned row in a matrix product.
  nn::Matrix<T> composition;       // cells x elements (zero where missing)
  nn::Matrix<T> composition_present;   // cells x 1
  std::vector<int> crystal_system;     // per cell, 0 = missing
  std::vector<int> space_group;        // per cell, 0 = missing
  nn::Matrix<T> properties;            // cells x properties (zero where missing)
  nn::Matrix<T> properties_present;    // cells x properties

  int atoms() const { return atom_offsets.empty() ? 0 : atom_offsets.back(); }
  int edges() const { return static_cast<int>(edge_receiver.size()); }
};

// Sinusoidal embedding of time u in (0, 1] (Vaswani et al. 2017, with u scaled by 1000 as for
// step indices): width/2 sines then width/2 cosines of 1000 u / 10000^(k / (width/2)).
void TimeEmbedding(double u, int width, double* out);

// Builds the batch. Cells below architecture.cutoff_from_atoms atoms get every ordered pair
// (i != j, minimum-image distance); larger cells every periodic neighbour within the cutoff.
// InvalidArgument naming "cells[c]..." for sizes that disagree with the architecture (token out
// of range, wrong number of properties or composition entries, non-finite input).
template <typename T>
GraphBatch<T> BuildGraphBatch(const Architecture& architecture, const std::vector<NoisyCell>& cells);

}  // namespace nucleate::model
