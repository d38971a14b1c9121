#include "core/symmetry/symmetry.h"

#include <algorithm>
#include <cmath>

#include "core/common/error.h"
#include "core/symmetry/spglib_call.h"

namespace nucleate::symmetry {
namespace {

using structure::Crystal;

// A reduced lattice must be the same lattice: integer change of basis with determinant +-1.
// spglib guarantees this; checking costs nothing and turns a silent corruption into an error.
constexpr double kIntegerTolerance = 1e-6;

double Wrap(double x) {
  const double w = x - std::floor(x);
  return w >= 1.0 ? 0.0 : w;
}

Crystal Rebase(const Crystal& crystal, const Eigen::Matrix3d& new_lattice) {
  // Rows: cart = frac^T L, so frac_new^T = frac^T L L_new^-1 = frac^T M with M = L L_new^-1.
  const Eigen::Matrix3d m = crystal.lattice * new_lattice.inverse();
  const Eigen::Matrix3d rounded = m.array().round().matrix();
  if ((m - rounded).cwiseAbs().maxCoeff() > kIntegerTolerance ||
      std::abs(std::abs(rounded.determinant()) - 1.0) > kIntegerTolerance)
    throw Internal("cell reduction changed the lattice (not a unimodular change of basis)");
  Crystal out = crystal;
  out.lattice = new_lattice;
  for (auto& f : out.frac) {
    const Eigen::Vector3d g = rounded.transpose() * f;
    f = Eigen::Vector3d(Wrap(g[0]), Wrap(g[1]), Wrap(g[2]));
  }
  return out;
}

SymmetryInfo FromDataset(const spglib_call::Dataset& d, double symprec, double angle_tolerance) {
  SymmetryInfo info;
  info.number = d.number;
  info.international = d.international_symbol;
  info.hall_number = d.hall_number;
  info.hall_symbol = d.hall_symbol;
  info.choice = d.choice;
  info.point_group = d.point_group;
  info.schoenflies = spglib_call::GetSpacegroupType(d.hall_number).schoenflies;
  info.crystal_system = CrystalSystemOf(d.number);
  info.wyckoffs = d.wyckoffs;
  info.site_symmetry_symbols = d.site_symmetry_symbols;
  info.equivalent_atoms = d.equivalent_atoms;
  info.operations.resize(d.rotations.size());
  for (std::size_t k = 0; k < d.rotations.size(); ++k) {
    info.operations[k].rotation = d.rotations[k];
    info.operations[k].translation = d.translations[k];
  }
  info.transformation_matrix = d.transformation_matrix;
  info.origin_shift = d.origin_shift;
  info.primitive_lattice = d.primitive_lattice;
  info.mapping_to_primitive = d.mapping_to_primitive;
  info.symprec = symprec;
  info.angle_tolerance = angle_tolerance;
  return info;
}

}  // namespace

CrystalSystem CrystalSystemOf(int n) {
  if (n < 1 || n > 230)
    throw InvalidArgument("space_group_number", "must be in 1..230, got " + std::to_string(n));
  if (n <= 2) return CrystalSystem::kTriclinic;
  if (n <= 15) return CrystalSystem::kMonoclinic;
  if (n <= 74) return CrystalSystem::kOrthorhombic;
  if (n <= 142) return CrystalSystem::kTetragonal;
  if (n <= 167) return CrystalSystem::kTrigonal;
  if (n <= 194) return CrystalSystem::kHexagonal;
  return CrystalSystem::kCubic;
}

const char* CrystalSystemName(CrystalSystem system) {
  switch (system) {
    case CrystalSystem::kTriclinic: return "triclinic";
    case CrystalSystem::kMonoclinic: return "monoclinic";
    case CrystalSystem::kOrthorhombic: return "orthorhombic";
    case CrystalSystem::kTetragonal: return "tetragonal";
    case CrystalSystem::kTrigonal: return "trigonal";
    case CrystalSystem::kHexagonal: return "hexagonal";
    case CrystalSystem::kCubic: return "cubic";
  }
  return "unknown";
}

SymmetryInfo AnalyseSymmetry(const Crystal& crystal, double symprec, double angle_tolerance) {
  return FromDataset(spglib_call::GetDataset(crystal, symprec, angle_tolerance), symprec,
                     angle_tolerance);
}

Crystal StandardConventionalCell(const Crystal& crystal, double symprec, double angle_tolerance,
                                 bool idealise) {
  return spglib_call::StandardizeCell(crystal, /*to_primitive=*/false, /*no_idealize=*/!idealise,
                                      symprec, angle_tolerance);
}

Crystal StandardPrimitiveCell(const Crystal& crystal, double symprec, double angle_tolerance,
                              bool idealise) {
  return spglib_call::StandardizeCell(crystal, /*to_primitive=*/true, /*no_idealize=*/!idealise,
                                      symprec, angle_tolerance);
}

Crystal Symmetrise(const Crystal& crystal, double symprec, double angle_tolerance) {
  return StandardConventionalCell(crystal, symprec, angle_tolerance, /*idealise=*/true);
}

Crystal NiggliReduce(const Crystal& crystal, double eps) {
  spglib_call::ValidateCell(crystal);
  return Rebase(crystal, spglib_call::NiggliReduceLattice(crystal.lattice, eps));
}

Crystal DelaunayReduce(const Crystal& crystal, double eps) {
  spglib_call::ValidateCell(crystal);
  return Rebase(crystal, spglib_call::DelaunayReduceLattice(crystal.lattice, eps));
}

std::vector<AsymmetricSite> AsymmetricUnit(const Crystal& crystal, const SymmetryInfo& info) {
  const std::size_t n = crystal.size();
  if (crystal.frac.size() != n || info.equivalent_atoms.size() != n ||
      info.wyckoffs.size() != n || info.site_symmetry_symbols.size() != n)
    throw InvalidArgument("info", "symmetry result does not belong to this structure (" +
                                      std::to_string(info.equivalent_atoms.size()) +
                                      " sites analysed, structure has " + std::to_string(n) + ")");
  std::vector<int> multiplicity(n, 0);
  for (int rep : info.equivalent_atoms) {
    if (rep < 0 || static_cast<std::size_t>(rep) >= n)
      throw InvalidArgument("info.equivalent_atoms", "index out of range");
    ++multiplicity[rep];
  }
  std::vector<AsymmetricSite> unit;
  for (std::size_t i = 0; i < n; ++i) {
    if (info.equivalent_atoms[i] != static_cast<int>(i)) continue;
    AsymmetricSite site;
    site.site = static_cast<int>(i);
    site.number = crystal.numbers[i];
    site.frac = crystal.frac[i];
    site.wyckoff = info.wyckoffs[i];
    site.site_symmetry = info.site_symmetry_symbols[i];
    site.multiplicity = multiplicity[i];
    unit.push_back(site);
  }
  return unit;
}

StandardSetting StandardSettingForCif(const Crystal& crystal, double symprec,
                                      double angle_tolerance) {
  StandardSetting out;
  out.cell = Symmetrise(crystal, symprec, angle_tolerance);
  // The idealised cell is symmetric to rounding error, so a tight tolerance recovers exactly its
  // group and cannot pick up a supergroup the original tolerance did not allow.
  const double tight = std::min(symprec, 1e-3);
  out.info = AnalyseSymmetry(out.cell, tight, angle_tolerance);
  const SymmetryInfo original = AnalyseSymmetry(crystal, symprec, angle_tolerance);
  if (out.info.number != original.number)
    throw Numerical("symprec", "the symmetrised cell has space group " +
                                   std::to_string(out.info.number) + ", the input " +
                                   std::to_string(original.number) +
                                   ": the tolerance sits on a boundary between groups");
  out.asymmetric_unit = AsymmetricUnit(out.cell, out.info);
  return out;
}

}  // namespace nucleate::symmetry
