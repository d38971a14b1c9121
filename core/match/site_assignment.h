// Site matching under one lattice mapping and one trial translation: each element's sites are
// paired by an exact minimum-sum-of-squares assignment (hungarian.h), the mean displacement is
// removed (it is a leftover origin shift, not a distortion), and the remaining displacements are
// measured.
#pragma once

#include <utility>
#include <vector>

#include <Eigen/Dense>

#include "core/match/hungarian.h"
#include "core/match/short_image.h"

namespace nucleate::match {

struct SiteWorkspace {
  std::vector<Eigen::Vector3d> vectors;  // block x block displacement vectors
  std::vector<double> cost;
  std::vector<int> assignment;
  std::vector<Eigen::Vector3d> chosen;   // one displacement per site, all blocks
  AssignmentWorkspace hungarian;
};

struct SiteFit {
  double rms = 0;  // root mean square of |displacement - mean displacement|, cell length units
  double max = 0;  // largest |displacement - mean displacement|
};

// The blocks in the order AssignSites checks them for a quick rejection: smallest first, since
// their sites have the fewest candidate partners and a wrong cell or origin usually shows there
// first (the verdict does not depend on the order). Computed once per pair, not per call.
void RejectionOrder(const std::vector<std::pair<int, int>>& blocks,
                    std::vector<std::pair<int, int>>* order);

// The quick rejection AssignSites applies to each block ([begin, end) of both arrays): whether
// every fixed site of the block has a mover site of the block within sqrt(reach2) (minimum image
// in `image`'s lattice) once moved by `shift`. Stops at the first partner found.
bool BlockHasPartners(const std::vector<Eigen::Vector3d>& mover,
                      const std::vector<Eigen::Vector3d>& fixed, std::pair<int, int> block,
                      const Eigen::Vector3d& shift, const ShortImage& image, double reach2);

// `mover` and `fixed` hold fractional coordinates in one common basis, sorted so that `blocks`
// ([begin, end) per element) index both. Displacements are minimum-image vectors in `image`'s
// lattice from fixed[j] + shift to its assigned mover site. Returns false, without assigning,
// when some fixed site has no same-element mover site within `reach`: then no assignment can get
// every displacement under reach / 2 after the mean is removed (see structure_matcher.cc).
// `check_order`: the blocks as RejectionOrder orders them.
bool AssignSites(const std::vector<Eigen::Vector3d>& mover,
                 const std::vector<Eigen::Vector3d>& fixed,
                 const std::vector<std::pair<int, int>>& blocks,
                 const std::vector<std::pair<int, int>>& check_order, const Eigen::Vector3d& shift,
                 const ShortImage& image, double reach, SiteWorkspace* workspace, SiteFit* fit);

}  // namespace nucleate::match
