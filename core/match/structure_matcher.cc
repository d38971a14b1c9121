#include "core/match/structure_matcher.h"

#include <cmath>
#include <cstdio>
#include <limits>
#include <vector>

#include "core/common/error.h"
#include "core/match/lattice_mapping.h"
#include "core/match/short_image.h"
#include "core/match/site_assignment.h"
#include "core/structure/lattice.h"

namespace nucleate::match {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

MatchResult NoMatch(const std::string& reason) {
  MatchResult r;
  r.rms = kNaN;
  r.max_displacement = kNaN;
  r.reason = reason;
  return r;
}

std::string Fixed2(double x) {
  char buffer[32];
  std::snprintf(buffer, sizeof buffer, "%.2f", x);
  return buffer;
}

// The cell whose lengths and angles are the means of the two cells': neither structure is
// privileged, and a uniform strain splits evenly between them.
Eigen::Matrix3d AverageLattice(const Eigen::Matrix3d& x, const Eigen::Matrix3d& y) {
  const auto p = structure::ParametersFromMatrix(x);
  const auto q = structure::ParametersFromMatrix(y);
  structure::LatticeParameters m;
  m.a = (p.a + q.a) / 2;
  m.b = (p.b + q.b) / 2;
  m.c = (p.c + q.c) / 2;
  m.alpha = (p.alpha + q.alpha) / 2;
  m.beta = (p.beta + q.beta) / 2;
  m.gamma = (p.gamma + q.gamma) / 2;
  return structure::MatrixFromParameters(m);
}

// The mover's sites in the mapped basis. For index 1 the mapping is unimodular and each site
// maps once; for a superlattice of index n each site appears n times, once per coset of the
// small lattice in the large one (k runs over the box spanned by the corners of the new cell).
// Sites stay grouped by element, matching the target's blocks. False if the cosets do not come
// out as n distinct translations (cannot happen for |det M| = n; guards rounding).
bool MapSites(const PreparedCrystal& mover, const Eigen::Matrix3i& m, int index,
              std::vector<Eigen::Vector3d>* out) {
  const Eigen::Matrix3d inverse_t = m.cast<double>().inverse().transpose();
  std::vector<Eigen::Vector3d> cosets;
  if (index == 1) {
    cosets.push_back(Eigen::Vector3d::Zero());
  } else {
    Eigen::Vector3i lo = Eigen::Vector3i::Zero(), hi = Eigen::Vector3i::Zero();
    for (int corner = 1; corner < 8; ++corner) {
      Eigen::Vector3i sum = Eigen::Vector3i::Zero();
      for (int r = 0; r < 3; ++r) {
        if (corner & (1 << r)) sum += m.row(r).transpose();
      }
      lo = lo.cwiseMin(sum);
      hi = hi.cwiseMax(sum);
    }
    for (int i = lo[0]; i <= hi[0]; ++i)
      for (int j = lo[1]; j <= hi[1]; ++j)
        for (int k = lo[2]; k <= hi[2]; ++k) {
          const Eigen::Vector3d y = inverse_t * Eigen::Vector3d(i, j, k);
          if ((y.array() >= -1e-9).all() && (y.array() < 1 - 1e-9).all()) {
            cosets.emplace_back(i, j, k);
          }
        }
    if (static_cast<int>(cosets.size()) != index) return false;
  }
  out->clear();
  for (std::size_t s = 0; s < mover.size(); ++s) {
    for (const auto& k : cosets) {
      out->push_back(structure::WrapFractional(inverse_t * (mover.frac[s] + k)));
    }
  }
  return true;
}

}  // namespace

MatchResult MatchStructures(const structure::Crystal& a, const structure::Crystal& b,
                            const MatchTolerances& tolerances) {
  ValidateTolerances(tolerances);  // first, so the error names the tolerance, not a crystal
  PreparedCrystal pa, pb;
  try {
    pa = Prepare(a, tolerances);
  } catch (const Error& e) {
    throw e.WithinField("a");
  }
  try {
    pb = Prepare(b, tolerances);
  } catch (const Error& e) {
    throw e.WithinField("b");
  }
  return MatchPrepared(pa, pb, tolerances);
}

MatchResult MatchPrepared(const PreparedCrystal& a, const PreparedCrystal& b,
                          const MatchTolerances& tol, bool stop_at_first_match) {
  if (a.formula != b.formula) return NoMatch("composition differs");

  // The mover's lattice is searched for cells like the target's basis. Equal counts: A moves
  // onto B. Otherwise the smaller structure's superlattices of the count ratio are searched.
  const PreparedCrystal* mover = &a;
  const PreparedCrystal* target = &b;
  int index = 1;
  if (a.size() != b.size()) {
    const std::size_t big = std::max(a.size(), b.size()), small = std::min(a.size(), b.size());
    if (!tol.allow_supercell || big % small != 0) {
      return NoMatch("site counts differ: " + std::to_string(a.size()) + " vs " +
                     std::to_string(b.size()));
    }
    index = static_cast<int>(big / small);
    mover = a.size() < b.size() ? &a : &b;
    target = a.size() < b.size() ? &b : &a;
  }
  // With scale_volume both prepared cells hold one volume unit per atom, so a superlattice of
  // index n of the smaller has the larger's volume without further scaling.
  const auto mappings = FindLatticeMappings(mover->lattice, target->lattice, tol.length_tolerance,
                                            tol.angle_tolerance, index);
  if (mappings.empty()) return NoMatch("no lattice mapping within tolerance");

  // Trial origins: the target's first site of its least frequent element lands on each mover
  // site of that element in turn.
  std::size_t anchor_block = 0;
  for (std::size_t k = 1; k < target->blocks.size(); ++k) {
    const auto size = [&](std::size_t q) { return target->blocks[q].second - target->blocks[q].first; };
    if (size(k) < size(anchor_block)) anchor_block = k;
  }
  const int anchor = target->blocks[anchor_block].first;

  const std::size_t n = target->size();
  std::vector<Eigen::Vector3d> mapped;
  SiteWorkspace workspace;
  bool matched = false;
  double best_rms = std::numeric_limits<double>::infinity();
  double best_max = std::numeric_limits<double>::infinity();
  for (const auto& mapping : mappings) {
    if (!MapSites(*mover, mapping.coefficients, index, &mapped)) continue;
    const Eigen::Matrix3d average = AverageLattice(mapping.basis, target->lattice);
    const double unit = std::cbrt(std::abs(average.determinant()) / static_cast<double>(n));
    const ShortImage image(average);
    // If an assignment leaves every site within stol of the mean shift, the trial origin that
    // puts the anchor on its own partner has every raw displacement under 2 stol (the anchor's
    // raw displacement is zero, so the mean is within stol of zero): a larger nearest distance
    // rules the origin out.
    const double reach = 2 * tol.site_tolerance * unit;
    const auto [begin, end] = target->blocks[anchor_block];
    for (int s = begin; s < end; ++s) {
      const Eigen::Vector3d shift = mapped[s] - target->frac[anchor];
      SiteFit fit;
      if (!AssignSites(mapped, target->frac, target->blocks, shift, image, reach, &workspace,
                       &fit)) {
        continue;
      }
      const double rms = fit.rms / unit, max = fit.max / unit;
      const bool ok = max < tol.site_tolerance;
      if (ok && (!matched || rms < best_rms)) {
        matched = true;
        best_rms = rms;
        best_max = max;
        if (stop_at_first_match) break;
      } else if (!matched && max < best_max) {
        best_rms = rms;
        best_max = max;
      }
    }
    if (matched && stop_at_first_match) break;
  }
  MatchResult r;
  r.match = matched;
  if (std::isinf(best_max)) {
    // Every trial origin was ruled out before assignment: some site is farther than 2 stol.
    r.rms = kNaN;
    r.max_displacement = kNaN;
    r.reason = "sites too far: a site has no partner within " + Fixed2(2 * tol.site_tolerance) +
               " under every cell and origin tried";
    return r;
  }
  r.rms = best_rms;
  r.max_displacement = best_max;
  if (!matched) {
    char tolerance[32];
    std::snprintf(tolerance, sizeof tolerance, "%g", tol.site_tolerance);
    r.reason = "sites too far: max " + Fixed2(best_max) + " > " + tolerance;
  }
  return r;
}

}  // namespace nucleate::match
