#include "integrations/demo/corpus/corpus_cell.h"

#include <algorithm>
#include <cmath>

#include "core/common/error.h"
#include "core/structure/lattice.h"
#include "core/structure/periodic_distances.h"

namespace nucleate::demo::corpus {
namespace {
constexpr double kPi = 3.14159265358979323846;
}  // namespace

Strain StrainFor(symmetry::CrystalSystem system, double max_strain, random::RandomStream& stream) {
  double u[4];
  for (double& value : u) value = max_strain * (2 * stream.Uniform() - 1);
  Strain strain;
  using symmetry::CrystalSystem;
  switch (system) {
    case CrystalSystem::kCubic:
      strain.a = strain.b = strain.c = u[0];
      break;
    case CrystalSystem::kTetragonal:
    case CrystalSystem::kTrigonal:
    case CrystalSystem::kHexagonal:
      strain.a = strain.b = u[0];
      strain.c = u[1];
      break;
    case CrystalSystem::kOrthorhombic:
      strain.a = u[0];
      strain.b = u[1];
      strain.c = u[2];
      break;
    case CrystalSystem::kMonoclinic:
      strain.a = u[0];
      strain.b = u[1];
      strain.c = u[2];
      strain.beta = u[3];
      break;
    case CrystalSystem::kTriclinic:
      throw Internal("the corpus has no triclinic structure type to strain");
  }
  return strain;
}

Eigen::Matrix3d ConventionalLattice(const CellShape& shape, double a, const Strain& strain) {
  structure::LatticeParameters p;
  p.a = a * (1 + strain.a);
  p.b = a * shape.b_over_a * (1 + strain.b);
  p.c = a * shape.c_over_a * (1 + strain.c);
  p.alpha = shape.alpha;
  p.beta = shape.beta + strain.beta * 180.0 / kPi;
  p.gamma = shape.gamma;
  return structure::MatrixFromParameters(p);
}

double ContactLength(const RoleCell& cell, const Eigen::Matrix3d& unit_primitive,
                     const RoleRadii& radii, const std::vector<bool>& is_anion, Bonding bonding) {
  const structure::MinimumImage image(unit_primitive);
  double length = 0;
  for (std::size_t i = 0; i < cell.frac.size(); ++i) {
    for (std::size_t j = i; j < cell.frac.size(); ++j) {
      const int ri = cell.roles[i], rj = cell.roles[j];
      if (bonding == Bonding::kIonic && is_anion[ri] == is_anion[rj]) continue;
      const double distance = i == j ? image.ShortestLatticeVector().distance
                                     : image.Between(cell.frac[i], cell.frac[j]).distance;
      length = std::max(length, (radii[ri] + radii[rj]) / distance);
    }
  }
  if (!(length > 0)) throw Internal("a corpus cell without a cation-anion contact to size it by");
  return length;
}

structure::Crystal AssembleCrystal(const PreparedType& type, const Composition& composition,
                                   const Strain& strain, double displacement_rms,
                                   random::RandomStream& displacements) {
  structure::Crystal crystal;
  crystal.lattice =
      type.primitive_transform * ConventionalLattice(composition.shape, composition.a, strain);
  // Per Cartesian component, so that the length of the displacement vector has this rms.
  const double sigma = displacement_rms / std::sqrt(3.0);
  for (std::size_t k = 0; k < composition.cell.frac.size(); ++k) {
    crystal.numbers.push_back(composition.numbers[composition.cell.roles[k]]);
    Eigen::Vector3d cartesian =
        structure::FractionalToCartesian(crystal.lattice, composition.cell.frac[k]);
    for (int d = 0; d < 3; ++d) cartesian[d] += sigma * displacements.Normal();
    crystal.frac.push_back(structure::WrapFractional(
        structure::CartesianToFractional(crystal.lattice, cartesian)));
  }
  return crystal;
}

}  // namespace nucleate::demo::corpus
