#include "core/match/lattice_index.h"

#include <algorithm>
#include <cmath>
#include <limits>

#include "core/common/error.h"
#include "core/match/lattice_points.h"

namespace nucleate::match {
namespace {

constexpr double kDegreesPerRadian = 57.29577951308232;
// Slack in the accepting direction on every comparison (log length; degrees): far above the
// rounding of the matcher's own ratio and angle arithmetic, far below any tolerance.
constexpr double kSlack = 1e-9;

// The same arithmetic as lattice_mapping.cc, so both see the same angle for the same vectors.
double AngleDegrees(const Eigen::Vector3d& x, const Eigen::Vector3d& y, double lx, double ly) {
  const double c = std::max(-1.0, std::min(1.0, x.dot(y) / (lx * ly)));
  return std::acos(c) * kDegreesPerRadian;
}

// Of v and -v, the one whose first non-zero coefficient is positive.
bool Canonical(const Eigen::Vector3i& c) {
  for (int k = 0; k < 3; ++k) {
    if (c[k] != 0) return c[k] > 0;
  }
  return false;
}

}  // namespace

LatticeIndex::LatticeIndex(double length_tolerance, double angle_tolerance) {
  for (int k = 0; k < 6; ++k) {
    half_width_[k] = (k < 3 ? std::log(1 + length_tolerance) : angle_tolerance) + kSlack;
    lo_[k] = std::numeric_limits<double>::infinity();
    hi_[k] = -std::numeric_limits<double>::infinity();
  }
  for (double& g : gap_) g = -std::numeric_limits<double>::infinity();
}

void LatticeIndex::Insert(int id, const Eigen::Matrix3d& lattice) {
  BoxTree::Coordinates x;
  const Eigen::Vector3d len = lattice.rowwise().norm();
  const Eigen::Vector3d t0 = lattice.row(0), t1 = lattice.row(1), t2 = lattice.row(2);
  for (int k = 0; k < 3; ++k) x[k] = std::log(len[k]);
  x[3] = AngleDegrees(t1, t2, len[1], len[2]);
  x[4] = AngleDegrees(t0, t2, len[0], len[2]);
  x[5] = AngleDegrees(t0, t1, len[0], len[1]);
  for (int k = 0; k < 6; ++k) {
    lo_[k] = std::min(lo_[k], x[k]);
    hi_[k] = std::max(hi_[k], x[k]);
  }
  gap_[0] = std::max(gap_[0], x[0] - x[1]);
  gap_[1] = std::max(gap_[1], x[1] - x[2]);
  gap_[2] = std::max(gap_[2], x[0] - x[2]);
  tree_.Insert(id, x);
  ids_.push_back(id);
}

void LatticeIndex::Query(const Eigen::Matrix3d& mover, std::vector<int>* out, int min_id) const {
  if (ids_.empty()) return;
  const std::size_t begin = out->size();
  // Any usable |v_k| is below (1 + ltol) |t_k| <= (1 + ltol) * (longest stored row).
  const double radius = std::exp(std::max({hi_[0], hi_[1], hi_[2]}) + half_width_[0]);
  std::vector<LatticePoint> points;
  try {
    points = LatticePointsWithin(mover, radius);
  } catch (const Error&) {
    // Too many lattice points to enumerate (a needle-like cell against a huge one): offer every
    // stored target rather than guess; the matcher then decides (and reports) pair by pair.
    out->insert(out->end(), std::lower_bound(ids_.begin(), ids_.end(), min_id), ids_.end());
    return;
  }
  const auto in = [&](int k, double x) {
    return x > lo_[k] - half_width_[k] && x < hi_[k] + half_width_[k];
  };
  // ln|v_i| < x_i + w and ln|v_j| > x_j - w, so ln|v_i| - ln|v_j| < (x_i - x_j) + 2w <= gap + 2w.
  const auto ordered = [&](int g, double xi, double xj) {
    return xi - xj < gap_[g] + 2 * half_width_[0];
  };
  std::vector<double> log_length(points.size());
  std::vector<int> slot[3];
  for (std::size_t i = 0; i < points.size(); ++i) {
    log_length[i] = std::log(points[i].length);
    for (int k = 0; k < 3; ++k) {
      if (in(k, log_length[i]) && (k > 0 || Canonical(points[i].coefficients))) {
        slot[k].push_back(static_cast<int>(i));
      }
    }
  }
  BoxTree::Coordinates x;
  for (int ia : slot[0]) {
    const LatticePoint& a = points[ia];
    x[0] = log_length[ia];
    for (int ib : slot[1]) {
      const LatticePoint& b = points[ib];
      x[1] = log_length[ib];
      if (!ordered(0, x[0], x[1])) continue;
      x[5] = AngleDegrees(a.cartesian, b.cartesian, a.length, b.length);
      if (!in(5, x[5])) continue;
      for (int ic : slot[2]) {
        const LatticePoint& c = points[ic];
        x[2] = log_length[ic];
        if (!ordered(1, x[1], x[2]) || !ordered(2, x[0], x[2])) continue;
        x[3] = AngleDegrees(b.cartesian, c.cartesian, b.length, c.length);
        if (!in(3, x[3])) continue;
        x[4] = AngleDegrees(a.cartesian, c.cartesian, a.length, c.length);
        if (!in(4, x[4])) continue;
        Eigen::Matrix3i m;
        m.row(0) = a.coefficients.transpose();
        m.row(1) = b.coefficients.transpose();
        m.row(2) = c.coefficients.transpose();
        const int det = m.determinant();  // exact integer arithmetic
        if (det != 1 && det != -1) continue;
        tree_.Query(x, half_width_, out);
      }
    }
  }
  // Several bases may reach one target; ids below min_id were offered but are not wanted.
  std::sort(out->begin() + begin, out->end());
  out->erase(std::unique(out->begin() + begin, out->end()), out->end());
  out->erase(out->begin() + begin,
             std::lower_bound(out->begin() + begin, out->end(), min_id));
}

bool LatticeScreenPasses(const Eigen::Matrix3d& mover, const Eigen::Matrix3d& target,
                         double length_tolerance, double angle_tolerance) {
  LatticeIndex index(length_tolerance, angle_tolerance);
  index.Insert(0, target);
  std::vector<int> found;
  index.Query(mover, &found);
  return !found.empty();
}

}  // namespace nucleate::match
