#include "core/match/site_assignment.h"

#include <algorithm>
#include <cmath>
#include <limits>

namespace nucleate::match {

void RejectionOrder(const std::vector<std::pair<int, int>>& blocks,
                    std::vector<std::pair<int, int>>* order) {
  // Insertion sort: stable, and without the buffer std::stable_sort would allocate per pair.
  order->assign(blocks.begin(), blocks.end());
  const auto size = [](const std::pair<int, int>& b) { return b.second - b.first; };
  for (std::size_t i = 1; i < order->size(); ++i) {
    for (std::size_t j = i; j > 0 && size((*order)[j]) < size((*order)[j - 1]); --j) {
      std::swap((*order)[j], (*order)[j - 1]);
    }
  }
}

bool BlockHasPartners(const std::vector<Eigen::Vector3d>& mover,
                      const std::vector<Eigen::Vector3d>& fixed, std::pair<int, int> block,
                      const Eigen::Vector3d& shift, const ShortImage& image, double reach2) {
  const auto [begin, end] = block;
  // Backwards (the verdict does not depend on the order): in the anchor's block the first site is
  // the matcher's anchor, which has its own partner under every trial origin; checked last, it is
  // skipped whenever another site fails.
  for (int j = end - 1; j >= begin; --j) {
    const Eigen::Vector3d target = fixed[j] + shift;
    bool found = false;
    for (int i = begin; i < end && !found; ++i) found = image.Within(mover[i] - target, reach2);
    if (!found) return false;
  }
  return true;
}

bool AssignSites(const std::vector<Eigen::Vector3d>& mover,
                 const std::vector<Eigen::Vector3d>& fixed,
                 const std::vector<std::pair<int, int>>& blocks,
                 const std::vector<std::pair<int, int>>& check_order, const Eigen::Vector3d& shift,
                 const ShortImage& image, double reach, SiteWorkspace* w, SiteFit* fit) {
  const double reach2 = reach * reach;
  w->chosen.resize(fixed.size());
  // Cheap rejection first, for every block, before any assignment is solved: most trial
  // translations of non-matching pairs fail here.
  // Only existence of a partner within reach matters here, so each search stops at the first.
  for (const auto& block : check_order) {
    if (!BlockHasPartners(mover, fixed, block, shift, image, reach2)) return false;
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
