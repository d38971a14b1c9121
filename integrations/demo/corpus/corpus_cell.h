// Geometry of one corpus cell: the conventional lattice of a shape, its symmetry-preserving
// strain, the cell size set by the radii, and the assembled crystal.
#pragma once

#include <vector>

#include <Eigen/Dense>

#include "core/random/random_stream.h"
#include "core/structure/crystal.h"
#include "core/symmetry/symmetry.h"
#include "integrations/demo/corpus/catalogue.h"

namespace nucleate::demo::corpus {

// Relative changes of the conventional cell parameters. The crystal system decides which are
// independent (StrainFor), so that the strained cell keeps the type's space group exactly.
struct Strain {
  double a = 0, b = 0, c = 0;  // relative change of each length
  double beta = 0;             // change of the monoclinic angle, radians
};

// Four uniform draws u in [-1, 1), scaled by max_strain: cubic uses one for all three lengths;
// tetragonal, trigonal and hexagonal one for a = b and one for c; orthorhombic three; monoclinic
// three and the fourth for beta (max_strain radians: 0.02 is 1.15 degrees). All four are always
// drawn, so the stream does not depend on the system.
Strain StrainFor(symmetry::CrystalSystem system, double max_strain, random::RandomStream& stream);

// Rows a, b, c in angstrom: `shape` scaled to `a`, strained, in nucleate's standard orientation.
Eigen::Matrix3d ConventionalLattice(const CellShape& shape, double a, const Strain& strain);

// The conventional a (angstrom) at which the tightest contact of `cell` equals its radius sum:
// cation-anion pairs for ionic compositions, every pair for metallic ones (an atom and its own
// images included). `unit_primitive` is the primitive lattice for a = 1; `is_anion` per role.
double ContactLength(const RoleCell& cell, const Eigen::Matrix3d& unit_primitive,
                     const RoleRadii& radii, const std::vector<bool>& is_anion, Bonding bonding);

// The primitive cell of `composition`, strained, each atom moved by a Gaussian displacement of
// `displacement_rms` angstrom (root mean square of the vector length; from `displacements`, three
// normal draws per atom in site order).
structure::Crystal AssembleCrystal(const PreparedType& type, const Composition& composition,
                                   const Strain& strain, double displacement_rms,
                                   random::RandomStream& displacements);

}  // namespace nucleate::demo::corpus
