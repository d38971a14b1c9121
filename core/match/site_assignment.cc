#include "core/match/site_assignment.h"

#include <algorithm>
#include <cmath>
#include <limits>

namespace nucleate::match {

bool AssignSites(const std::vector<Eigen::Vector3d>& mover,
                 const std::vector<Eigen::Vector3d>& fixed,
                 const std::vector<std::pair<int, int>>& blocks, const Eigen::Vector3d& shift,
                 const ShortImage& image, double reach, SiteWorkspace* w, SiteFit* fit) {
  const double reach2 = reach * reach;
  w->chosen.resize(fixed.size());
  // Cheap rejection first, for every block, before any assignment is solved: most trial
  // translations of non-matching pairs fail here.
  // Only existence of a partner within reach matters here, so each search stops at the first.
  // Smallest blocks first: their sites have the fewest candidate partners, so a wrong cell or
  // origin usually shows there first (the verdict does not depend on the order).
  // (More than 8 elements: input order, to keep the scratch space fixed.)
  std::pair<int, int> order[8];
  const bool reorder = blocks.size() <= 8;
  if (reorder) {
    std::partial_sort_copy(blocks.begin(), blocks.end(), order, order + blocks.size(),
                           [](const std::pair<int, int>& x, const std::pair<int, int>& y) {
                             return x.second - x.first < y.second - y.first;
                           });
  }
  for (std::size_t b = 0; b < blocks.size(); ++b) {
    const auto [begin, end] = reorder ? order[b] : blocks[b];
    const int nb = end - begin;
    for (int j = 0; j < nb; ++j) {
      const Eigen::Vector3d target = fixed[begin + j] + shift;
      bool found = false;
      for (int i = 0; i < nb && !found; ++i) found = image.Within(mover[begin + i] - target, reach2);
      if (!found) return false;
    }
  }
  for (const auto& [begin, end] : blocks) {
    const int nb = end - begin;
    w->vectors.resize(static_cast<std::size_t>(nb) * nb);
    w->cost.resize(static_cast<std::size_t>(nb) * nb);
    for (int j = 0; j < nb; ++j) {
      const Eigen::Vector3d target = fixed[begin + j] + shift;
      for (int i = 0; i < nb; ++i) {
        const Eigen::Vector3d v = image.Vector(mover[begin + i] - target);
        w->vectors[j * nb + i] = v;
        w->cost[j * nb + i] = v.squaredNorm();
      }
    }
    if (nb == 1) {
      w->chosen[begin] = w->vectors[0];
      continue;
    }
    SolveAssignment(w->cost.data(), nb, &w->assignment, &w->hungarian);
    for (int j = 0; j < nb; ++j) w->chosen[begin + j] = w->vectors[j * nb + w->assignment[j]];
  }
  Eigen::Vector3d mean = Eigen::Vector3d::Zero();
  for (const auto& v : w->chosen) mean += v;
  mean /= static_cast<double>(w->chosen.size());
  double sum2 = 0, max2 = 0;
  for (const auto& v : w->chosen) {
    const double d2 = (v - mean).squaredNorm();
    sum2 += d2;
    max2 = std::max(max2, d2);
  }
  fit->rms = std::sqrt(sum2 / static_cast<double>(w->chosen.size()));
  fit->max = std::sqrt(max2);
  return true;
}

}  // namespace nucleate::match
