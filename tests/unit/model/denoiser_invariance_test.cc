// The denoiser's symmetries, end to end in float32 (core/model/DESIGN.md, "The network"): outputs
// follow a permutation of atoms and do not change under a rotation of the Cartesian frame, a common
// translation of all atoms, or integer image shifts of single atoms. Tolerance 1e-5 of the largest
// output (float32 rounding through a few layers; the symmetries are exact in exact arithmetic).
#include <algorithm>
#include <cmath>
#include <numeric>
#include <vector>

#include <gtest/gtest.h>

#include "core/model/denoiser.h"
#include "core/model/lattice_features.h"
#include "core/model/nn/parameters.h"
#include "tests/unit/model/model_test_support.h"

namespace nucleate::model {
namespace {

using nn::Matrix;

class Invariance : public ::testing::TestWithParam<int> {
 protected:
  void SetUp() override {
    architecture_ = testing::TinyArchitecture();
    architecture_.hidden = 16;
    architecture_.cutoff_from_atoms = 8;  // parameter 12 exercises cutoff neighbours
    denoiser_ = std::make_unique<Denoiser>(architecture_);
    weights_ = nn::Initialise<float>(denoiser_->layout(), 5);
    cell_ = testing::RandomCell(architecture_, GetParam(), 21, false);
    SetFeatures(&cell_);
  }

  void SetFeatures(NoisyCell* c) const {
    const LatticeFeatures f = LatticeToFeatures(c->lattice, static_cast<int>(c->frac.size()));
    for (int k = 0; k < 6; ++k) c->lattice_features[k] = f[k];
  }

  DenoiserOutput<float> Run(const NoisyCell& c) const {
    const auto batch = BuildGraphBatch<float>(architecture_, {c});
    DenoiserOutput<float> out;
    denoiser_->Forward<float>(batch, weights_.data(), &out, nullptr);
    return out;
  }

  static double Scale(const DenoiserOutput<float>& o) {
    return std::max({1.0, double(o.coordinate_score.cwiseAbs().maxCoeff()),
                     double(o.lattice_noise.cwiseAbs().maxCoeff()),
                     double(o.species_logits.cwiseAbs().maxCoeff())});
  }

  static void ExpectSame(const DenoiserOutput<float>& a, const DenoiserOutput<float>& b,
                         const std::vector<int>& order) {
    const double tol = 1e-5 * Scale(a);
    for (std::size_t i = 0; i < order.size(); ++i) {
      for (int k = 0; k < 3; ++k) {
        EXPECT_NEAR(a.coordinate_score(order[i], k), b.coordinate_score(i, k), tol) << i << "," << k;
      }
      for (int k = 0; k < a.species_logits.cols(); ++k) {
        EXPECT_NEAR(a.species_logits(order[i], k), b.species_logits(i, k), tol) << i << "," << k;
      }
    }
    for (int k = 0; k < 6; ++k) EXPECT_NEAR(a.lattice_noise(0, k), b.lattice_noise(0, k), tol);
  }

  std::vector<int> Identity() const {
    std::vector<int> order(cell_.frac.size());
    std::iota(order.begin(), order.end(), 0);
    return order;
  }

  Architecture architecture_;
  std::unique_ptr<Denoiser> denoiser_;
  std::vector<float> weights_;
  NoisyCell cell_;
};

TEST_P(Invariance, PermutationOfAtoms) {
  std::vector<int> order = Identity();
  std::reverse(order.begin(), order.end());
  std::rotate(order.begin(), order.begin() + 1, order.end());
  NoisyCell permuted = cell_;
  for (std::size_t i = 0; i < order.size(); ++i) {
    permuted.frac[i] = cell_.frac[order[i]];
    permuted.tokens[i] = cell_.tokens[order[i]];
  }
  ExpectSame(Run(cell_), Run(permuted), order);
}

TEST_P(Invariance, RotationOfTheCartesianFrame) {
  NoisyCell rotated = cell_;
  const Eigen::Matrix3d r =
      Eigen::AngleAxisd(1.234, Eigen::Vector3d(0.3, -0.5, 0.8).normalized()).toRotationMatrix();
  rotated.lattice = cell_.lattice * r.transpose();  // rows are vectors: each row rotated
  SetFeatures(&rotated);
  ExpectSame(Run(cell_), Run(rotated), Identity());
}

TEST_P(Invariance, CommonTranslation) {
  NoisyCell shifted = cell_;
  const Eigen::Vector3d shift(0.37, -0.81, 0.55);
  for (auto& f : shifted.frac) {
    f += shift;
    for (int k = 0; k < 3; ++k) f[k] -= std::floor(f[k]);
  }
  ExpectSame(Run(cell_), Run(shifted), Identity());
}

TEST_P(Invariance, ImageShiftOfSingleAtoms) {
  NoisyCell moved = cell_;
  for (std::size_t i = 0; i < moved.frac.size(); ++i) {
    moved.frac[i] += Eigen::Vector3d(double(i % 3) - 1, 2.0 * (i % 2), -3.0 * (i % 4 == 1));
  }
  ExpectSame(Run(cell_), Run(moved), Identity());
}

TEST_P(Invariance, ScoreIsMeanFree) {
  const auto out = Run(cell_);
  const double scale = Scale(out);
  for (int k = 0; k < 3; ++k) EXPECT_NEAR(out.coordinate_score.col(k).sum(), 0.0, 1e-5 * scale);
}

// 4 atoms: all pairs; 12 atoms: cutoff neighbours (cutoff_from_atoms = 8 here).
INSTANTIATE_TEST_SUITE_P(CellSizes, Invariance, ::testing::Values(4, 12));

}  // namespace
}  // namespace nucleate::model
