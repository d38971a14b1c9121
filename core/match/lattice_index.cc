#include "core/match/lattice_index.h"

#include <algorithm>
#include <cmath>
#include <limits>

#include "core/common/error.h"
#include "core/match/lattice_points.h"

namespace nucleate::match {
namespace {

// Slack in the accepting direction on every comparison (log length; degrees): far above the
// rounding of the matcher's own ratio and angle arithmetic, far below any tolerance.
constexpr double kSlack = 1e-9;

// Of v and -v, the one whose first non-zero coefficient is positive.
bool Canonical(const Eigen::Vector3i& c) {
  for (int k = 0; k < 3; ++k) {
    if (c[k] != 0) return c[k] > 0;
  }
  return false;
}

BoxTree::Coordinates HalfWidths(double length_tolerance, double angle_tolerance) {
  BoxTree::Coordinates half;
  for (int k = 0; k < 6; ++k) {
    half[k] = (k < 3 ? std::log(1 + length_tolerance) : angle_tolerance) + kSlack;
  }
  return half;
}

}  // namespace

LatticeIndex::LatticeIndex(double length_tolerance, double angle_tolerance)
    : tree_(HalfWidths(length_tolerance, angle_tolerance)),
      half_width_(HalfWidths(length_tolerance, angle_tolerance)) {
  for (int k = 0; k < 6; ++k) {
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

void LatticeIndex::Query(const Eigen::Matrix3d& mover, LatticeHits* out, int min_id) const {
  out->bases.clear();
  out->hits.clear();
  out->bases_known = true;
  if (ids_.empty()) return;
  // Any usable |v_k| is below (1 + ltol) |t_k| <= (1 + ltol) * (longest stored row).
  const double radius = std::exp(std::max({hi_[0], hi_[1], hi_[2]}) + half_width_[0]);
  LatticeHits::Scratch& w = out->scratch;
  std::vector<LatticePoint>& points = w.points;
  try {
    LatticePointsWithin(mover, radius, &points);
  } catch (const Error&) {
    // Too many lattice points to enumerate (a needle-like cell against a huge one): offer every
    // stored target rather than guess; the matcher then decides (and reports) pair by pair.
    out->bases_known = false;
    for (auto id = std::lower_bound(ids_.begin(), ids_.end(), min_id); id != ids_.end(); ++id) {
      out->hits.emplace_back(*id, -1);
    }
    return;
  }
  const auto in = [&](int k, double x) {
    return x > lo_[k] - half_width_[k] && x < hi_[k] + half_width_[k];
  };
  // The angle ranges as cosine windows: an angle outside its range is mostly recognised from the
  // cosine alone, before the acos (CosineWindow never rejects an angle that `in` accepts).
  double cos_lo[3], cos_hi[3];
  for (int k = 0; k < 3; ++k) {
    CosineWindow(lo_[3 + k] - half_width_[3 + k], hi_[3 + k] + half_width_[3 + k], &cos_lo[k],
                 &cos_hi[k]);
  }
  // The angle between x and y as slot 3 + k of a point, or false if outside its range.
  const auto angle = [&](int k, const LatticePoint& x, const LatticePoint& y, double* degrees) {
    const double c = x.cartesian.dot(y.cartesian) / (x.length * y.length);
    if (!(c > cos_lo[k] && c < cos_hi[k])) return false;
    *degrees = AngleDegrees(x.cartesian, y.cartesian, x.length, y.length);
    return in(3 + k, *degrees);
  };
  // ln|v_i| < x_i + w and ln|v_j| > x_j - w, so ln|v_i| - ln|v_j| < (x_i - x_j) + 2w <= gap + 2w.
  const auto ordered = [&](int g, double xi, double xj) {
    return xi - xj < gap_[g] + 2 * half_width_[0];
  };
  std::vector<double>& log_length = w.log_length;
  std::vector<int>* const slot = w.slot;
  log_length.resize(points.size());
  for (auto& s : w.slot) s.clear();
  for (std::size_t i = 0; i < points.size(); ++i) {
    log_length[i] = std::log(points[i].length);
    for (int k = 0; k < 3; ++k) {
      if (in(k, log_length[i]) && (k > 0 || Canonical(points[i].coefficients))) {
        slot[k].push_back(static_cast<int>(i));
      }
    }
  }
  // The tests on the third vector c against b (order, alpha) and against a (order, beta) do not
  // depend on the other vector, so each pair is judged once, when first needed, rather than once
  // per triple: per b, the c in slot 2 that pass with it and their angles; per a, the angle with
  // each c in slot 2, or NaN if the pair fails.
  CheckMappingSearchSize(slot[0].size(), slot[1].size(), slot[2].size());
  const std::size_t n2 = slot[2].size();
  const double nan = std::numeric_limits<double>::quiet_NaN();
  // (position in slot 2, alpha): the runs of the b judged so far, b's run in with_b[b].
  auto& thirds = w.thirds;
  auto& with_b = w.with_b;
  auto& with_b_done = w.with_b_done;
  auto& beta = w.beta;  // row qa (n2 angles) valid once beta_done[qa]
  auto& beta_done = w.beta_done;
  thirds.clear();
  with_b.assign(slot[1].size(), {0, 0});
  with_b_done.assign(slot[1].size(), 0);
  beta.resize(slot[0].size() * n2);
  beta_done.assign(slot[0].size(), 0);
  BoxTree::Coordinates x;
  std::vector<int>& found = w.found;
  for (std::size_t qa = 0; qa < slot[0].size(); ++qa) {
    const int ia = slot[0][qa];
    const LatticePoint& a = points[ia];
    x[0] = log_length[ia];
    double* const beta_a = beta.data() + qa * n2;
    for (std::size_t qb = 0; qb < slot[1].size(); ++qb) {
      const int ib = slot[1][qb];
      const LatticePoint& b = points[ib];
      x[1] = log_length[ib];
      if (!ordered(0, x[0], x[1]) || !angle(2, a, b, &x[5])) continue;
      if (!with_b_done[qb]) {
        with_b_done[qb] = 1;
        with_b[qb].first = thirds.size();
        for (std::size_t qc = 0; qc < n2; ++qc) {
          const int ic = slot[2][qc];
          double degrees;
          if (ordered(1, x[1], log_length[ic]) && angle(0, b, points[ic], &degrees)) {
            thirds.emplace_back(qc, degrees);
          }
        }
        with_b[qb].second = thirds.size();
      }
      if (!beta_done[qa]) {
        beta_done[qa] = 1;
        for (std::size_t qc = 0; qc < n2; ++qc) {
          const int ic = slot[2][qc];
          double degrees;
          beta_a[qc] = ordered(2, x[0], log_length[ic]) && angle(1, a, points[ic], &degrees)
                           ? degrees
                           : nan;
        }
      }
      for (std::size_t t = with_b[qb].first; t < with_b[qb].second; ++t) {
        const std::size_t qc = thirds[t].first;
        x[3] = thirds[t].second;
        x[4] = beta_a[qc];
        if (std::isnan(x[4])) continue;
        const int ic = slot[2][qc];
        const LatticePoint& c = points[ic];
        x[2] = log_length[ic];
        CandidateBasis v;
        v.mapping.coefficients.row(0) = a.coefficients.transpose();
        v.mapping.coefficients.row(1) = b.coefficients.transpose();
        v.mapping.coefficients.row(2) = c.coefficients.transpose();
        const int det = v.mapping.coefficients.determinant();  // exact integer arithmetic
        if (det != 1 && det != -1) continue;
        found.clear();
        tree_.Query(x, half_width_, &found);
        if (found.empty()) continue;
        const int basis = static_cast<int>(out->bases.size());
        for (int id : found) {
          if (id >= min_id) out->hits.emplace_back(id, basis);
        }
        v.mapping.basis.row(0) = a.cartesian.transpose();
        v.mapping.basis.row(1) = b.cartesian.transpose();
        v.mapping.basis.row(2) = c.cartesian.transpose();
        v.length[0] = a.length;
        v.length[1] = b.length;
        v.length[2] = c.length;
        for (int k = 0; k < 3; ++k) v.angle[k] = x[3 + k];
        out->bases.push_back(v);
      }
    }
  }
  // Bases are numbered in enumeration order, and each reports a target at most once.
  std::sort(out->hits.begin(), out->hits.end());
}

void LatticeIndex::Query(const Eigen::Matrix3d& mover, std::vector<int>* out, int min_id) const {
  LatticeHits hits;
  Query(mover, &hits, min_id);
  for (const auto& [id, basis] : hits.hits) {
    if (out->empty() || out->back() != id) out->push_back(id);
  }
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
