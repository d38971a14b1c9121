#include "core/model/nn/layers.h"

#include <cmath>
#include <string>

#include "core/common/error.h"

namespace nucleate::model::nn {
namespace {

constexpr double kLayerNormEpsilon = 1e-5;

// The network builds every shape and index it hands to a layer, so a mismatch is a bug inside
// nucleate, not a bad request: Internal, naming the argument.
void RequireEqual(const char* what, Eigen::Index got, Eigen::Index expected) {
  if (got != expected) {
    throw Internal(std::string(what) + " is " + std::to_string(got) + ", expected " +
                   std::to_string(expected));
  }
}

void RequireIndices(const char* what, const std::vector<int>& indices, Eigen::Index limit) {
  for (std::size_t r = 0; r < indices.size(); ++r) {
    if (indices[r] < 0 || indices[r] >= limit) {
      throw Internal(std::string(what) + "[" + std::to_string(r) + "] = " +
                     std::to_string(indices[r]) + " is outside [0, " + std::to_string(limit) +
                     ")");
    }
  }
}

// offsets: segments + 1 non-decreasing entries from 0 to rows.
void RequireOffsets(const std::vector<int>& offsets, Eigen::Index rows) {
  if (offsets.empty() || offsets.front() != 0 || offsets.back() != rows) {
    throw Internal("offsets must run from 0 to the row count " + std::to_string(rows));
  }
  for (std::size_t s = 1; s < offsets.size(); ++s) {
    if (offsets[s] < offsets[s - 1]) throw Internal("offsets must not decrease");
  }
}

int SegmentCount(const std::vector<int>& offsets) { return static_cast<int>(offsets.size()) - 1; }

// Rows first .. first + count - 1 added one at a time in row order, so the sum is the same
// whatever the thread count, vector width or Eigen's choice of reduction tree.
template <typename T>
RowVector<T> SumRowsInOrder(const Matrix<T>& x, int first, int count) {
  RowVector<T> sum = RowVector<T>::Zero(x.cols());
  for (int r = first; r < first + count; ++r) sum += x.row(r);
  return sum;
}

template <typename T>
ConstMatrixMap<T> Tensor(const T* values, std::size_t offset, int rows, int cols) {
  return ConstMatrixMap<T>(values + offset, rows, cols);
}
template <typename T>
MatrixMap<T> Tensor(T* values, std::size_t offset, int rows, int cols) {
  return MatrixMap<T>(values + offset, rows, cols);
}

}  // namespace

// ---- Linear -------------------------------------------------------------------------------------

Linear AddLinear(ParameterLayout* layout, const std::string& name, int in, int out) {
  Linear l;
  l.in = in;
  l.out = out;
  // in <= 0 is refused by Add; the guard only keeps the square root defined until then.
  const double scale = in > 0 ? 1.0 / std::sqrt(static_cast<double>(in)) : 0.0;
  l.weight = layout->Add(name + ".weight", in, out, TensorSpec::Init::kNormal, scale);
  l.bias = layout->Add(name + ".bias", 1, out, TensorSpec::Init::kZero, 0.0);
  l.weight_offset = layout->tensor(l.weight).offset;
  l.bias_offset = layout->tensor(l.bias).offset;
  return l;
}

template <typename T>
void LinearForward(const Linear& l, const T* params, const Matrix<T>& x, Matrix<T>* y) {
  RequireEqual("Linear input columns", x.cols(), l.in);
  if (y == &x) throw Internal("LinearForward: y must not alias x");
  const auto weight = Tensor(params, l.weight_offset, l.in, l.out);
  const auto bias = Tensor(params, l.bias_offset, 1, l.out);
  y->resize(x.rows(), l.out);
  y->noalias() = x * weight;
  y->rowwise() += bias.row(0);
}

template <typename T>
void LinearBackward(const Linear& l, const T* params, const Matrix<T>& x, const Matrix<T>& dy,
                    T* grads, Matrix<T>* dx) {
  RequireEqual("Linear input columns", x.cols(), l.in);
  RequireEqual("Linear output-gradient columns", dy.cols(), l.out);
  RequireEqual("Linear output-gradient rows", dy.rows(), x.rows());
  if (dx == &x || dx == &dy) throw Internal("LinearBackward: dx must not alias x or dy");
  auto weight_grad = Tensor(grads, l.weight_offset, l.in, l.out);
  auto bias_grad = Tensor(grads, l.bias_offset, 1, l.out);
  weight_grad.noalias() += x.transpose() * dy;
  bias_grad.row(0) += dy.colwise().sum();
  if (dx != nullptr) {
    const auto weight = Tensor(params, l.weight_offset, l.in, l.out);
    dx->resize(dy.rows(), l.in);
    dx->noalias() = dy * weight.transpose();
  }
}

// ---- SiLU ---------------------------------------------------------------------------------------

template <typename T>
void SiluForward(const Matrix<T>& x, Matrix<T>* y) {
  // x / (1 + e^-x): for very negative x the denominator overflows to infinity and y is -0, never
  // NaN.
  y->resize(x.rows(), x.cols());
  y->array() = x.array() / (T(1) + (-x.array()).exp());
}

template <typename T>
void SiluBackward(const Matrix<T>& x, const Matrix<T>& dy, Matrix<T>* dx) {
  RequireEqual("SiLU output-gradient rows", dy.rows(), x.rows());
  RequireEqual("SiLU output-gradient columns", dy.cols(), x.cols());
  // d/dx [x s(x)] = s + x s (1 - s) = s (1 + x (1 - s)), s the logistic sigmoid.
  const auto sigmoid = (T(1) / (T(1) + (-x.array()).exp())).eval();
  const auto slope = (sigmoid * (T(1) + x.array() * (T(1) - sigmoid))).eval();
  dx->resize(x.rows(), x.cols());
  dx->array() = dy.array() * slope;
}

// ---- LayerNorm ----------------------------------------------------------------------------------

LayerNorm AddLayerNorm(ParameterLayout* layout, const std::string& name, int width) {
  LayerNorm l;
  l.width = width;
  l.gain = layout->Add(name + ".gain", 1, width, TensorSpec::Init::kOne, 0.0);
  l.shift = layout->Add(name + ".shift", 1, width, TensorSpec::Init::kZero, 0.0);
  l.gain_offset = layout->tensor(l.gain).offset;
  l.shift_offset = layout->tensor(l.shift).offset;
  return l;
}

template <typename T>
void LayerNormForward(const LayerNorm& l, const T* params, const Matrix<T>& x, Matrix<T>* y,
                      LayerNormCache<T>* cache) {
  RequireEqual("LayerNorm input columns", x.cols(), l.width);
  const auto gain = Tensor(params, l.gain_offset, 1, l.width);
  const auto shift = Tensor(params, l.shift_offset, 1, l.width);
  const Eigen::Index rows = x.rows();
  cache->normalised.resize(rows, l.width);
  cache->inverse_std.resize(rows);
  const T inverse_width = T(1) / T(l.width);
  for (Eigen::Index r = 0; r < rows; ++r) {
    // Two passes (mean, then squared deviations) keep float variances accurate for rows with a
    // large mean.
    const T mean = x.row(r).sum() * inverse_width;
    const auto centred = (x.row(r).array() - mean).eval();
    const T variance = centred.square().sum() * inverse_width;
    const T inverse_std = T(1) / std::sqrt(variance + T(kLayerNormEpsilon));
    cache->inverse_std[r] = inverse_std;
    cache->normalised.row(r) = centred * inverse_std;
  }
  y->resize(rows, l.width);
  y->array() = (cache->normalised.array().rowwise() * gain.row(0).array()).rowwise() +
               shift.row(0).array();
}

template <typename T>
void LayerNormBackward(const LayerNorm& l, const T* params, const LayerNormCache<T>& cache,
                       const Matrix<T>& dy, T* grads, Matrix<T>* dx) {
  const Matrix<T>& normalised = cache.normalised;
  RequireEqual("LayerNorm output-gradient columns", dy.cols(), l.width);
  RequireEqual("LayerNorm output-gradient rows", dy.rows(), normalised.rows());
  auto gain_grad = Tensor(grads, l.gain_offset, 1, l.width);
  auto shift_grad = Tensor(grads, l.shift_offset, 1, l.width);
  gain_grad.row(0).array() += (dy.array() * normalised.array()).colwise().sum();
  shift_grad.row(0) += dy.colwise().sum();
  if (dx == nullptr) return;
  // With n = (x - mean) / s, s = sqrt(var + eps), and g = dL/dn = dy * gain:
  // dL/dx = (g - mean(g) - n * mean(g * n)) / s, row by row (eps kept inside s, so exact).
  const auto gain = Tensor(params, l.gain_offset, 1, l.width);
  const Matrix<T> g = (dy.array().rowwise() * gain.row(0).array()).matrix();
  dx->resize(dy.rows(), l.width);
  for (Eigen::Index r = 0; r < dy.rows(); ++r) {
    const T mean_g = g.row(r).mean();
    const T mean_gn = g.row(r).cwiseProduct(normalised.row(r)).mean();
    dx->row(r) = cache.inverse_std[r] *
                 (g.row(r).array() - mean_g - normalised.row(r).array() * mean_gn).matrix();
  }
}

// ---- Embedding ----------------------------------------------------------------------------------

Embedding AddEmbedding(ParameterLayout* layout, const std::string& name, int count, int width) {
  Embedding e;
  e.count = count;
  e.width = width;
  e.table = layout->Add(name + ".table", count, width, TensorSpec::Init::kNormal, 1.0);
  e.table_offset = layout->tensor(e.table).offset;
  return e;
}

template <typename T>
void EmbeddingForward(const Embedding& e, const T* params, const std::vector<int>& ids,
                      Matrix<T>* y) {
  RequireIndices("Embedding ids", ids, e.count);
  const auto table = Tensor(params, e.table_offset, e.count, e.width);
  y->resize(static_cast<Eigen::Index>(ids.size()), e.width);
  for (std::size_t r = 0; r < ids.size(); ++r) y->row(r) = table.row(ids[r]);
}

template <typename T>
void EmbeddingBackward(const Embedding& e, const std::vector<int>& ids, const Matrix<T>& dy,
                       T* grads) {
  RequireIndices("Embedding ids", ids, e.count);
  RequireEqual("Embedding output-gradient rows", dy.rows(), static_cast<Eigen::Index>(ids.size()));
  RequireEqual("Embedding output-gradient columns", dy.cols(), e.width);
  auto table_grad = Tensor(grads, e.table_offset, e.count, e.width);
  for (std::size_t r = 0; r < ids.size(); ++r) table_grad.row(ids[r]) += dy.row(r);
}

// ---- Row gather ---------------------------------------------------------------------------------

template <typename T>
void GatherRows(const Matrix<T>& x, const std::vector<int>& index, Matrix<T>* y) {
  RequireIndices("GatherRows index", index, x.rows());
  if (y == &x) throw Internal("GatherRows: y must not alias x");
  y->resize(static_cast<Eigen::Index>(index.size()), x.cols());
  for (std::size_t r = 0; r < index.size(); ++r) y->row(r) = x.row(index[r]);
}

template <typename T>
void GatherRowsBackward(const Matrix<T>& dy, const std::vector<int>& index, int x_rows,
                        Matrix<T>* dx) {
  RequireIndices("GatherRows index", index, x_rows);
  RequireEqual("GatherRows output-gradient rows", dy.rows(), static_cast<Eigen::Index>(index.size()));
  if (dx == &dy) throw Internal("GatherRowsBackward: dx must not alias dy");
  dx->setZero(x_rows, dy.cols());
  for (std::size_t r = 0; r < index.size(); ++r) dx->row(index[r]) += dy.row(r);
}

// ---- Segments -----------------------------------------------------------------------------------

template <typename T>
void SegmentMean(const Matrix<T>& x, const std::vector<int>& offsets, Matrix<T>* y) {
  RequireOffsets(offsets, x.rows());
  if (y == &x) throw Internal("SegmentMean: y must not alias x");
  const int segments = SegmentCount(offsets);
  y->resize(segments, x.cols());
  for (int s = 0; s < segments; ++s) {
    const int count = offsets[s + 1] - offsets[s];
    if (count == 0) {
      y->row(s).setZero();
    } else {
      y->row(s) = SumRowsInOrder(x, offsets[s], count) / T(count);
    }
  }
}

template <typename T>
void SegmentMeanBackward(const Matrix<T>& dy, const std::vector<int>& offsets, Matrix<T>* dx) {
  RequireOffsets(offsets, offsets.empty() ? 0 : offsets.back());
  RequireEqual("SegmentMean output-gradient rows", dy.rows(), SegmentCount(offsets));
  if (dx == &dy) throw Internal("SegmentMeanBackward: dx must not alias dy");
  dx->resize(offsets.back(), dy.cols());
  for (int s = 0; s < SegmentCount(offsets); ++s) {
    const int count = offsets[s + 1] - offsets[s];
    for (int r = offsets[s]; r < offsets[s + 1]; ++r) dx->row(r) = dy.row(s) / T(count);
  }
}

template <typename T>
void SegmentBroadcast(const Matrix<T>& x, const std::vector<int>& offsets, Matrix<T>* y) {
  RequireOffsets(offsets, offsets.empty() ? 0 : offsets.back());
  RequireEqual("SegmentBroadcast input rows", x.rows(), SegmentCount(offsets));
  if (y == &x) throw Internal("SegmentBroadcast: y must not alias x");
  y->resize(offsets.back(), x.cols());
  for (int s = 0; s < SegmentCount(offsets); ++s) {
    for (int r = offsets[s]; r < offsets[s + 1]; ++r) y->row(r) = x.row(s);
  }
}

template <typename T>
void SegmentBroadcastBackward(const Matrix<T>& dy, const std::vector<int>& offsets,
                              Matrix<T>* dx) {
  RequireOffsets(offsets, dy.rows());
  if (dx == &dy) throw Internal("SegmentBroadcastBackward: dx must not alias dy");
  const int segments = SegmentCount(offsets);
  dx->resize(segments, dy.cols());
  for (int s = 0; s < segments; ++s) {
    dx->row(s) = SumRowsInOrder(dy, offsets[s], offsets[s + 1] - offsets[s]);
  }
}

template <typename T>
void RemoveSegmentMean(const std::vector<int>& offsets, Matrix<T>* x) {
  RequireOffsets(offsets, x->rows());
  for (int s = 0; s < SegmentCount(offsets); ++s) {
    const int count = offsets[s + 1] - offsets[s];
    if (count == 0) continue;
    const RowVector<T> mean = SumRowsInOrder(*x, offsets[s], count) / T(count);
    x->middleRows(offsets[s], count).rowwise() -= mean;
  }
}

// ---- Instantiations -----------------------------------------------------------------------------

#define NUCLEATE_INSTANTIATE_LAYERS(T)                                                            \
  template void LinearForward<T>(const Linear&, const T*, const Matrix<T>&, Matrix<T>*);         \
  template void LinearBackward<T>(const Linear&, const T*, const Matrix<T>&, const Matrix<T>&,   \
                                  T*, Matrix<T>*);                                               \
  template void SiluForward<T>(const Matrix<T>&, Matrix<T>*);                                    \
  template void SiluBackward<T>(const Matrix<T>&, const Matrix<T>&, Matrix<T>*);                 \
  template void LayerNormForward<T>(const LayerNorm&, const T*, const Matrix<T>&, Matrix<T>*,    \
                                    LayerNormCache<T>*);                                         \
  template void LayerNormBackward<T>(const LayerNorm&, const T*, const LayerNormCache<T>&,       \
                                     const Matrix<T>&, T*, Matrix<T>*);                          \
  template void EmbeddingForward<T>(const Embedding&, const T*, const std::vector<int>&,         \
                                    Matrix<T>*);                                                 \
  template void EmbeddingBackward<T>(const Embedding&, const std::vector<int>&, const Matrix<T>&, \
                                     T*);                                                        \
  template void GatherRows<T>(const Matrix<T>&, const std::vector<int>&, Matrix<T>*);            \
  template void GatherRowsBackward<T>(const Matrix<T>&, const std::vector<int>&, int,            \
                                      Matrix<T>*);                                               \
  template void SegmentMean<T>(const Matrix<T>&, const std::vector<int>&, Matrix<T>*);           \
  template void SegmentMeanBackward<T>(const Matrix<T>&, const std::vector<int>&, Matrix<T>*);   \
  template void SegmentBroadcast<T>(const Matrix<T>&, const std::vector<int>&, Matrix<T>*);      \
  template void SegmentBroadcastBackward<T>(const Matrix<T>&, const std::vector<int>&,           \
                                            Matrix<T>*);                                         \
  template void RemoveSegmentMean<T>(const std::vector<int>&, Matrix<T>*);

NUCLEATE_INSTANTIATE_LAYERS(float)
NUCLEATE_INSTANTIATE_LAYERS(double)
#undef NUCLEATE_INSTANTIATE_LAYERS

}  // namespace nucleate::model::nn
