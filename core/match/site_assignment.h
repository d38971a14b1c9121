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

// `mover` and `fixed` hold fractional coordinates in one common basis, sorted so that `blocks`
// ([begin, end) per element) index both. Displacements are minimum-image vectors in `image`'s
// lattice from fixed[j] + shift to its assigned mover site. Returns false, without assigning,
// when some fixed site has no same-element mover site within `reach`: then no assignment can get
// every displacement under reach / 2 after the mean is removed (see structure_matcher.cc).
bool AssignSites(const std::vector<Eigen::Vector3d>& mover,
                 const std::vector<Eigen::Vector3d>& fixed,
                 const std::vector<std::pair<int, int>>& blocks, const Eigen::Vector3d& shift,
                 const ShortImage& image, double reach, SiteWorkspace* workspace, SiteFit* fit);

}  // namespace nucleate::match
