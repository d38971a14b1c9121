#include "integrations/demo/corpus/space_group.h"

#include <cmath>

#include "core/common/error.h"
#include "core/structure/io/symmetry_operation.h"
#include "core/structure/lattice.h"

namespace nucleate::demo::corpus {
namespace {

using structure::SymmetryOperation;

constexpr double kSameFraction = 1e-6;

// Distance of x from the nearest integer.
double OffInteger(double x) { return std::abs(x - std::round(x)); }

bool SameModuloLattice(const Eigen::Vector3d& a, const Eigen::Vector3d& b) {
  for (int k = 0; k < 3; ++k) {
    if (OffInteger(a[k] - b[k]) > kSameFraction) return false;
  }
  return true;
}

bool SameOperation(const SymmetryOperation& a, const SymmetryOperation& b) {
  return a.rotation == b.rotation && SameModuloLattice(a.translation, b.translation);
}

// (a * b)(x) = a(b(x)), translation wrapped.
SymmetryOperation Compose(const SymmetryOperation& a, const SymmetryOperation& b) {
  SymmetryOperation c;
  c.rotation = a.rotation * b.rotation;
  c.translation = structure::WrapFractional(a.rotation.cast<double>() * b.translation + a.translation);
  return c;
}

std::vector<Eigen::Vector3d> CentringTranslations(Centring centring) {
  switch (centring) {
    case Centring::kP: return {};
    case Centring::kC: return {{0.5, 0.5, 0}};
    case Centring::kI: return {{0.5, 0.5, 0.5}};
    case Centring::kF: return {{0, 0.5, 0.5}, {0.5, 0, 0.5}, {0.5, 0.5, 0}};
    case Centring::kR: return {{2.0 / 3, 1.0 / 3, 1.0 / 3}, {1.0 / 3, 2.0 / 3, 2.0 / 3}};
  }
  return {};
}

}  // namespace

std::vector<SymmetryOperation> ExpandGroup(const SpaceGroup& group) {
  std::vector<SymmetryOperation> generators;
  for (std::size_t g = 0; g < group.generators.size(); ++g) {
    SymmetryOperation op = structure::io::ParseSymmetryOperation(
        group.generators[g], Describe(group) + " generator " + std::to_string(g));
    op.translation = structure::WrapFractional(op.translation);
    generators.push_back(op);
  }
  for (const Eigen::Vector3d& t : CentringTranslations(group.centring)) {
    SymmetryOperation op;
    op.translation = t;
    generators.push_back(op);
  }
  // Closure: multiply every known operation by every generator until nothing new appears. A group
  // of at most 192 operations (m-3m with F centring) closes in a few passes.
  std::vector<SymmetryOperation> operations{SymmetryOperation{}};
  for (std::size_t next = 0; next < operations.size(); ++next) {
    for (const SymmetryOperation& g : generators) {
      const SymmetryOperation candidate = Compose(g, operations[next]);
      bool known = false;
      for (const SymmetryOperation& op : operations) {
        if (SameOperation(op, candidate)) {
          known = true;
          break;
        }
      }
      if (known) continue;
      operations.push_back(candidate);
      if (static_cast<int>(operations.size()) > group.order) {
        throw Internal(Describe(group) + ": the generators give more than the " +
                       std::to_string(group.order) + " operations of the International Tables");
      }
    }
  }
  if (static_cast<int>(operations.size()) != group.order) {
    throw Internal(Describe(group) + ": the generators give " + std::to_string(operations.size()) +
                   " operations, the International Tables " + std::to_string(group.order));
  }
  return operations;
}

std::vector<Eigen::Vector3d> Orbit(const std::vector<SymmetryOperation>& operations,
                                   const Eigen::Vector3d& point) {
  std::vector<Eigen::Vector3d> images;
  for (const SymmetryOperation& op : operations) {
    const Eigen::Vector3d image = structure::WrapFractional(op.Apply(point));
    bool known = false;
    for (const Eigen::Vector3d& seen : images) {
      if (SameModuloLattice(seen, image)) {
        known = true;
        break;
      }
    }
    if (!known) images.push_back(image);
  }
  return images;
}

Eigen::Matrix3d PrimitiveTransform(Centring centring) {
  Eigen::Matrix3d p;
  switch (centring) {
    case Centring::kP: p.setIdentity(); break;
    case Centring::kC: p << 0.5, 0.5, 0, -0.5, 0.5, 0, 0, 0, 1; break;
    case Centring::kI: p << -0.5, 0.5, 0.5, 0.5, -0.5, 0.5, 0.5, 0.5, -0.5; break;
    case Centring::kF: p << 0, 0.5, 0.5, 0.5, 0, 0.5, 0.5, 0.5, 0; break;
    case Centring::kR:
      p << 2.0 / 3, 1.0 / 3, 1.0 / 3, -1.0 / 3, 1.0 / 3, 1.0 / 3, -1.0 / 3, -2.0 / 3, 1.0 / 3;
      break;
  }
  return p;
}

std::string Describe(const SpaceGroup& group) {
  std::string text = std::string(group.symbol) + " (" + std::to_string(group.number) + ")";
  if (group.setting[0] != '\0') text += std::string(", ") + group.setting;
  return text;
}

}  // namespace nucleate::demo::corpus
