#include "core/structure/io/site_expansion.h"

#include <algorithm>
#include <cmath>
#include <unordered_map>

#include "core/common/error.h"
#include "core/elements/elements.h"
#include "core/structure/lattice.h"

namespace nucleate::structure::io {

namespace {

// Buckets sites by fractional coordinate so that a new image is compared with the sites in its
// own and neighbouring buckets only: a plain all-pairs merge costs sites x images x sites, which
// for a few thousand atoms from 192 operations is billions of distance evaluations.
class SiteGrid {
 public:
  SiteGrid(const Eigen::Matrix3d& lattice, double tolerance) : lattice_(lattice), tolerance_(tolerance) {
    // A site within `tolerance` of another differs in fractional coordinate i by at most
    // tolerance * |b_i| (b_i the reciprocal vector), so buckets of at least that width make the
    // match lie in the same or an adjacent bucket.
    const Eigen::Matrix3d reciprocal = structure::ReciprocalLattice(lattice);
    for (int i = 0; i < 3; ++i) {
      const double width = tolerance * reciprocal.row(i).norm();
      bins_[i] = static_cast<int>(std::clamp(std::floor(1.0 / std::max(width, 1e-12)), 1.0, 64.0));
    }
  }

  // Index of a stored site within tolerance of `frac`, or -1.
  int Find(const Eigen::Vector3d& frac, const std::vector<Eigen::Vector3d>& stored) const {
    const Eigen::Vector3i cell = Cell(frac);
    for (int dx = -1; dx <= 1; ++dx) {
      for (int dy = -1; dy <= 1; ++dy) {
        for (int dz = -1; dz <= 1; ++dz) {
          const auto it = buckets_.find(Key(cell + Eigen::Vector3i(dx, dy, dz)));
          if (it == buckets_.end()) continue;
          for (int index : it->second) {
            Eigen::Vector3d delta = stored[index] - frac;
            for (int k = 0; k < 3; ++k) delta[k] -= std::round(delta[k]);
            if ((lattice_.transpose() * delta).norm() <= tolerance_) return index;
          }
        }
      }
    }
    return -1;
  }

  void Add(const Eigen::Vector3d& frac, int index) { buckets_[Key(Cell(frac))].push_back(index); }

 private:
  Eigen::Vector3i Cell(const Eigen::Vector3d& frac) const {
    Eigen::Vector3i cell;
    for (int i = 0; i < 3; ++i) {
      cell[i] = std::min(static_cast<int>(std::floor(frac[i] * bins_[i])), bins_[i] - 1);
    }
    return cell;
  }
  std::int64_t Key(const Eigen::Vector3i& cell) const {
    std::int64_t key = 0;
    for (int i = 0; i < 3; ++i) {
      const int wrapped = ((cell[i] % bins_[i]) + bins_[i]) % bins_[i];
      key = key * 64 + wrapped;
    }
    return key;
  }

  Eigen::Matrix3d lattice_;
  double tolerance_;
  int bins_[3] = {1, 1, 1};
  std::unordered_map<std::int64_t, std::vector<int>> buckets_;
};

std::string Symbol(int number) {
  const elements::Element* e = elements::FindElement(number);
  return e ? e->symbol : std::to_string(number);
}

}  // namespace

ExpandedSites ExpandSites(const Eigen::Matrix3d& lattice, const std::vector<AsymmetricSite>& sites,
                          const std::vector<SymmetryOperation>& operations, double tolerance,
                          std::int64_t max_atoms) {
  ExpandedSites out;
  std::vector<int> origin;  // which listed site each stored site came from
  SiteGrid grid(lattice, tolerance);
  for (std::size_t s = 0; s < sites.size(); ++s) {
    const AsymmetricSite& site = sites[s];
    bool warned = false;
    for (const SymmetryOperation& op : operations) {
      const Eigen::Vector3d image = structure::WrapFractional(op.Apply(site.frac));
      const int match = grid.Find(image, out.frac);
      if (match >= 0) {
        const AsymmetricSite& other = sites[origin[match]];
        if (origin[match] == static_cast<int>(s) || warned) continue;
        if (out.numbers[match] != site.number) {
          throw Error(ErrorKind::kUnsupported, site.where,
                      "site '" + site.label + "' (" + Symbol(site.number) + ") lies on site '" +
                          other.label + "' (" + Symbol(other.number) +
                          ") after symmetry expansion: two elements on one site is disorder, "
                          "which is not supported");
        }
        out.warnings.push_back(site.where + ": site '" + site.label + "' coincides with site '" +
                               other.label + "' after symmetry expansion; merged");
        warned = true;
        continue;
      }
      if (static_cast<std::int64_t>(out.numbers.size()) >= max_atoms) {
        throw LimitExceeded(site.where, "symmetry expansion gives more than " +
                                            std::to_string(max_atoms) +
                                            " atoms, above the max_atoms limit");
      }
      grid.Add(image, static_cast<int>(out.numbers.size()));
      out.numbers.push_back(site.number);
      out.frac.push_back(image);
      origin.push_back(static_cast<int>(s));
    }
  }
  return out;
}

}  // namespace nucleate::structure::io
