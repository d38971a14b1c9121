// The network's layers, each a forward and a hand-written backward pass. Conventions:
//  * x is (rows x in); a batch of atoms, edges or cells is a stack of rows.
//  * Backward passes ACCUMULATE (+=) parameter gradients into `grads` (a flat array laid out like
//    `params`), so micro-batches and shared layers add up; they OVERWRITE the input gradient dx
//    (resized), which may be null when the caller does not need it.
//  * Whatever the backward pass needs from the forward pass is passed back in explicitly (the
//    caller keeps it), so layers hold no state and one layer object serves any number of threads.
// Every function is instantiated for float and double (layers.cc); tests check each backward pass
// against central finite differences in double (tests/unit/nn/).
#pragma once

#include <cstddef>
#include <string>
#include <vector>

#include "core/model/nn/parameters.h"
#include "core/model/nn/tensor.h"

namespace nucleate::model::nn {

// y = x W + b, W (in x out), b (1 x out). Weights start N(0, 1/in) (variance-preserving for unit
// inputs), the bias at zero.
struct Linear {
  int weight = -1, bias = -1;  // tensor indices in the layout
  // Where the tensors start in the flat array: the passes get `params`, not the layout.
  std::size_t weight_offset = 0, bias_offset = 0;
  int in = 0, out = 0;
};
Linear AddLinear(ParameterLayout* layout, const std::string& name, int in, int out);
template <typename T>
void LinearForward(const Linear& l, const T* params, const Matrix<T>& x, Matrix<T>* y);
template <typename T>
void LinearBackward(const Linear& l, const T* params, const Matrix<T>& x, const Matrix<T>& dy,
                    T* grads, Matrix<T>* dx);

// y = x * sigmoid(x), elementwise. Backward needs the forward input x.
template <typename T>
void SiluForward(const Matrix<T>& x, Matrix<T>* y);
template <typename T>
void SiluBackward(const Matrix<T>& x, const Matrix<T>& dy, Matrix<T>* dx);

// Per row: y = (x - mean) / sqrt(var + 1e-5) * gain + shift (gain starts at 1, shift at 0).
// Forward also returns what backward needs: the normalised rows and 1/sqrt(var + eps) per row.
struct LayerNorm {
  int gain = -1, shift = -1;  // tensor indices in the layout
  std::size_t gain_offset = 0, shift_offset = 0;  // where they start in the flat array
  int width = 0;
};
LayerNorm AddLayerNorm(ParameterLayout* layout, const std::string& name, int width);
template <typename T>
struct LayerNormCache {
  Matrix<T> normalised;
  std::vector<T> inverse_std;
};
template <typename T>
void LayerNormForward(const LayerNorm& l, const T* params, const Matrix<T>& x, Matrix<T>* y,
                      LayerNormCache<T>* cache);
template <typename T>
void LayerNormBackward(const LayerNorm& l, const T* params, const LayerNormCache<T>& cache,
                       const Matrix<T>& dy, T* grads, Matrix<T>* dx);

// y_r = E[ids[r]]: a learned table of `count` vectors of `width` (N(0, 1) at the start).
struct Embedding {
  int table = -1;               // tensor index in the layout
  std::size_t table_offset = 0;  // where it starts in the flat array
  int count = 0, width = 0;
};
Embedding AddEmbedding(ParameterLayout* layout, const std::string& name, int count, int width);
template <typename T>
void EmbeddingForward(const Embedding& e, const T* params, const std::vector<int>& ids,
                      Matrix<T>* y);
template <typename T>
void EmbeddingBackward(const Embedding& e, const std::vector<int>& ids, const Matrix<T>& dy,
                       T* grads);

// Row gather: y_r = x[index[r]]. Backward scatter-adds dy rows into dx (size x_rows), in row
// order, so the sum order is fixed.
template <typename T>
void GatherRows(const Matrix<T>& x, const std::vector<int>& index, Matrix<T>* y);
template <typename T>
void GatherRowsBackward(const Matrix<T>& dy, const std::vector<int>& index, int x_rows,
                        Matrix<T>* dx);

// Segment mean over contiguous row ranges: y_s = mean of x rows offsets[s] .. offsets[s+1]-1
// (zero for an empty segment). offsets has segments + 1 entries, starting at 0 and ending at
// x.rows(). Used for edges -> atoms (edges sorted by receiving atom) and atoms -> cells.
template <typename T>
void SegmentMean(const Matrix<T>& x, const std::vector<int>& offsets, Matrix<T>* y);
template <typename T>
void SegmentMeanBackward(const Matrix<T>& dy, const std::vector<int>& offsets, Matrix<T>* dx);

// Broadcast of one row per segment to every row of the segment: y_r = x[s] for offsets[s] <= r <
// offsets[s+1]. Backward sums each segment's dy rows.
template <typename T>
void SegmentBroadcast(const Matrix<T>& x, const std::vector<int>& offsets, Matrix<T>* y);
template <typename T>
void SegmentBroadcastBackward(const Matrix<T>& dy, const std::vector<int>& offsets,
                              Matrix<T>* dx);

// Subtracts each segment's mean row from its rows (the translation projection of the coordinate
// score). Linear and self-adjoint, so the backward pass is the same projection of dy.
template <typename T>
void RemoveSegmentMean(const std::vector<int>& offsets, Matrix<T>* x);

}  // namespace nucleate::model::nn
