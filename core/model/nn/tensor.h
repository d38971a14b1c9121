// Matrix types of the network: row-major, so one row is one atom, edge or cell, and a batch is a
// stack of rows. Templates run in float (training, sampling) and double (gradient checks).
#pragma once

#include <Eigen/Dense>

namespace nucleate::model::nn {

template <typename T>
using Matrix = Eigen::Matrix<T, Eigen::Dynamic, Eigen::Dynamic, Eigen::RowMajor>;
template <typename T>
using RowVector = Eigen::Matrix<T, 1, Eigen::Dynamic>;
template <typename T>
using MatrixMap = Eigen::Map<Matrix<T>>;
template <typename T>
using ConstMatrixMap = Eigen::Map<const Matrix<T>>;

}  // namespace nucleate::model::nn
