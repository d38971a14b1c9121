#include "core/match/structure_matcher.h"

#include <cmath>
#include <cstdio>
#include <limits>
#include <optional>
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


// The mover's sites in the basis of one lattice mapping, computed block by block on demand: most
// trial origins are ruled out by the anchor's block alone, so most mappings never need the other
// sites. For index 1 the mapping is unimodular and each site maps once; for a superlattice of
// index n each site appears n times, once per coset of the small lattice in the large one (k runs
// over the box spanned by the corners of the new cell), so mover block [b, e) becomes [n b, n e),
// the target's block of that element. Each site is computed by the same expression whether it
// is needed early or late, so the result never depends on the order of the requests.
class MappedSites {
 public:
  explicit MappedSites(MatcherWorkspace* w) : w_(*w) {}

  // False if the cosets do not come out as n distinct translations (cannot happen for
  // |det M| = n; guards rounding).
  bool Reset(const PreparedCrystal& mover, const Eigen::Matrix3i& m, int index) {
    mover_ = &mover;
    index_ = index;
    inverse_t_ = m.cast<double>().inverse().transpose();
    w_.cosets.clear();
    if (index == 1) {
      w_.cosets.push_back(Eigen::Vector3d::Zero());
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
            const Eigen::Vector3d y = inverse_t_ * Eigen::Vector3d(i, j, k);
            if ((y.array() >= -1e-9).all() && (y.array() < 1 - 1e-9).all()) {
              w_.cosets.emplace_back(i, j, k);
            }
          }
      if (static_cast<int>(w_.cosets.size()) != index) return false;
    }
    w_.mapped.resize(mover.size() * static_cast<std::size_t>(index));
    w_.block_mapped.assign(mover.blocks.size(), 0);
    return true;
  }

  void Map(std::size_t block) {
    if (w_.block_mapped[block]) return;
    w_.block_mapped[block] = 1;
    const auto [begin, end] = mover_->blocks[block];
    std::size_t out = static_cast<std::size_t>(begin) * static_cast<std::size_t>(index_);
    for (int s = begin; s < end; ++s) {
      for (const auto& k : w_.cosets) {
        w_.mapped[out++] = structure::WrapFractional(inverse_t_ * (mover_->frac[s] + k));
      }
    }
  }

  void MapAll() {
    for (std::size_t b = 0; b < mover_->blocks.size(); ++b) Map(b);
  }

  const std::vector<Eigen::Vector3d>& sites() const { return w_.mapped; }

 private:
  MatcherWorkspace& w_;
  const PreparedCrystal* mover_ = nullptr;
  int index_ = 1;
  Eigen::Matrix3d inverse_t_;
};

}  // namespace

Eigen::Matrix3d AverageLattice(const Eigen::Matrix3d& x, const structure::LatticeParameters& q) {
  const auto p = structure::ParametersFromMatrix(x);
  structure::LatticeParameters m;
  m.a = (p.a + q.a) / 2;
  m.b = (p.b + q.b) / 2;
  m.c = (p.c + q.c) / 2;
  m.alpha = (p.alpha + q.alpha) / 2;
  m.beta = (p.beta + q.beta) / 2;
  m.gamma = (p.gamma + q.gamma) / 2;
  return structure::MatrixFromParameters(m);
}

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

namespace {

// What the site search over a list of lattice mappings found (see MatchResult for best_*).
struct SiteSearch {
  bool matched = false;
  double best_rms = std::numeric_limits<double>::infinity();
  double best_max = std::numeric_limits<double>::infinity();
};

// The part of matching after the lattice search, shared by MatchPrepared and MatchesUnderBases:
// under each mapping, every trial origin the anchor screen lets through (anchor_screen.h: it
// rules out only origins AssignSites would reject), each judged by AssignSites.
// `target_parameters`: ParametersFromMatrix(target.lattice); `anchor_target`:
// AnchorTargetOf(target).
SiteSearch SearchSites(const PreparedCrystal& mover, const PreparedCrystal& target,
                       const structure::LatticeParameters& target_parameters,
                       const AnchorTarget& anchor_target, int index,
                       const std::vector<LatticeMapping>& mappings, const MatchTolerances& tol,
                       bool stop_at_first_match, MatcherWorkspace* workspace) {
  SiteSearch result;
  // Trial origins: the target's first site of its least frequent element lands on each mover
  // site of that element in turn.
  const std::size_t anchor_block = AnchorBlock(target);
  const int anchor = target.blocks[anchor_block].first;
  RejectionOrder(target.blocks, &workspace->check_order);

  const std::size_t n = target.size();
  MappedSites mapped(workspace);
  // The averaged cell depends on the mapped basis only through its lengths and angles, which are
  // bit for bit the same for v and -v (norms, dot and cross products of negated vectors are
  // exactly those of the vectors), so a mapping whose basis is the negation of the previous one
  // reuses the previous cell (MatchesUnderBases lists such pairs next to each other).
  const LatticeMapping* previous = nullptr;
  Eigen::Matrix3d average;
  double unit = 0;
  std::optional<ShortImage> image;
  // The anchor screen gives the origins of a mapping and of its negation at once (the negation's
  // mover side is the mapping's with every site negated, bit for bit, and the same cell), so a
  // mapping that negates the last one screened takes that screen's `minus`.
  const ScreenedBlocks screened = ScreenedBlocksOf(mover);
  const LatticeMapping* last_screened = nullptr;
  AnchorShifts shifts;
  for (const auto& mapping : mappings) {
    // Trial origins that may pass (anchor_screen.h); for a superlattice (index > 1) every one.
    std::uint64_t may_pass = ~std::uint64_t{0};
    if (index == 1) {
      if (last_screened && mapping.coefficients == -last_screened->coefficients &&
          mapping.basis == -last_screened->basis) {
        may_pass = shifts.minus;
        last_screened = nullptr;
      } else {
        SetAnchorMover(mover, screened, mapping.coefficients, mapping.basis, &workspace->anchor);
        shifts = AnchorShiftsThatMayPass(workspace->anchor, anchor_target, tol.site_tolerance);
        may_pass = shifts.plus;
        last_screened = &mapping;
      }
    }
    if (may_pass == 0) continue;
    if (!mapped.Reset(mover, mapping.coefficients, index)) continue;
    if (!previous || mapping.basis != -previous->basis) {
      average = AverageLattice(mapping.basis, target_parameters);
      unit = std::cbrt(std::abs(average.determinant()) / static_cast<double>(n));
      image.emplace(average);
    }
    previous = &mapping;
    // If an assignment leaves every site within stol of the mean shift, the trial origin that
    // puts the anchor on its own partner has every raw displacement under 2 stol (the anchor's
    // raw displacement is zero, so the mean is within stol of zero): a larger nearest distance
    // rules the origin out.
    const double reach = 2 * tol.site_tolerance * unit;
    // AssignSites rejects an origin when any block has a site without a partner within reach;
    // the anchor's block is checked first, on its own mapped sites, and the rest of the sites
    // are only mapped for an origin that passes (AssignSites then checks it again: same verdict).
    mapped.Map(anchor_block);
    const auto [begin, end] = target.blocks[anchor_block];
    for (int s = begin; s < end; ++s) {
      if (s - begin < 64 && !(may_pass >> (s - begin) & 1)) continue;
      const Eigen::Vector3d shift = mapped.sites()[s] - target.frac[anchor];
      if (!BlockHasPartners(mapped.sites(), target.frac, target.blocks[anchor_block], shift,
                            *image, reach * reach)) {
        continue;
      }
      mapped.MapAll();
      SiteFit fit;
      if (!AssignSites(mapped.sites(), target.frac, target.blocks, workspace->check_order, shift,
                       *image, reach, &workspace->sites, &fit)) {
        continue;
      }
      const double rms = fit.rms / unit, max = fit.max / unit;
      const bool ok = max < tol.site_tolerance;
      if (ok && (!result.matched || rms < result.best_rms)) {
        result.matched = true;
        result.best_rms = rms;
        result.best_max = max;
        if (stop_at_first_match) break;
      } else if (!result.matched && max < result.best_max) {
        result.best_rms = rms;
        result.best_max = max;
      }
    }
    if (result.matched && stop_at_first_match) break;
  }
  return result;
}

}  // namespace

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

  MatcherWorkspace workspace;
  const SiteSearch found =
      SearchSites(*mover, *target, structure::ParametersFromMatrix(target->lattice),
                  AnchorTargetOf(*target), index, mappings, tol, stop_at_first_match, &workspace);
  MatchResult r;
  r.match = found.matched;
  if (std::isinf(found.best_max)) {
    // Every trial origin was ruled out before assignment: some site is farther than 2 stol.
    r.rms = kNaN;
    r.max_displacement = kNaN;
    r.reason = "sites too far: a site has no partner within " + Fixed2(2 * tol.site_tolerance) +
               " under every cell and origin tried";
    return r;
  }
  r.rms = found.best_rms;
  r.max_displacement = found.best_max;
  if (!found.matched) {
    char tolerance[32];
    std::snprintf(tolerance, sizeof tolerance, "%g", tol.site_tolerance);
    r.reason = "sites too far: max " + Fixed2(found.best_max) + " > " + tolerance;
  }
  return r;
}

TargetShape ShapeOf(const PreparedCrystal& b, const MatchTolerances& tol) {
  return {MappingTest(b.lattice, tol.length_tolerance, tol.angle_tolerance),
          structure::ParametersFromMatrix(b.lattice), AnchorTargetOf(b)};
}

bool MatchesUnderBases(const PreparedCrystal& a, const PreparedCrystal& b,
                       const MatchTolerances& tol, const TargetShape& shape,
                       const std::vector<const CandidateBasis*>& bases,
                       MatcherWorkspace* workspace) {
  if (a.formula != b.formula) return false;
  if (a.size() != b.size()) return MatchPrepared(a, b, tol, true).match;  // a superlattice search
  // Exactly FindLatticeMappings(a.lattice, b.lattice, ..., 1), up to order: every basis it would
  // return is among `bases` up to sign, the lengths and angles carried with each basis are those
  // it computes (same points, same AngleDegrees), MappingTest is its test, and the determinant of
  // each basis is +-1 already. The negation of a basis passes or fails with it and is built bit
  // for bit as FindLatticeMappings builds it (negated integers times the lattice). The order of
  // the mappings cannot change the verdict of a search that stops at the first match.
  std::vector<LatticeMapping>& mappings = workspace->mappings;
  mappings.clear();
  for (const CandidateBasis* v : bases) {
    if (!shape.test.Accepts(*v)) continue;
    mappings.push_back(v->mapping);
    mappings.push_back({-v->mapping.coefficients, -v->mapping.basis});
  }
  if (mappings.empty()) return false;
  return SearchSites(a, b, shape.parameters, shape.anchor, 1, mappings, tol, true, workspace)
      .matched;
}

}  // namespace nucleate::match
