#include "core/symmetry/spglib_call.h"

#include <algorithm>
#include <cmath>
#include <memory>
#include <mutex>
#include <sstream>

extern "C" {
#include <spglib.h>
}

#include "core/common/error.h"

namespace nucleate::symmetry::spglib_call {
namespace {

using structure::Crystal;

// Below this volume (angstrom^3) a cell cannot hold an atom: the smallest real cells are several
// cubic angstrom per atom. It only rejects degenerate input, never a physical crystal.
constexpr double kMinVolume = 1e-3;
// |det| / (|a| |b| |c|) is the sine-like "flatness" of the cell; 1 for orthogonal vectors. Below
// this the three vectors are coplanar to working precision and spglib's metric is meaningless.
constexpr double kMinFlatness = 1e-6;

// spglib 2.0.2 keeps its error code in a static and has no other guard: every call into it, and
// the read of its error code that follows, happens under this one mutex.
std::mutex& SpglibMutex() {
  static std::mutex mutex;
  return mutex;
}

// THE row/column conversion. nucleate stores the cell vectors as rows; spglib's lattice[i][j] is
// component i of vector j (vectors as columns). The map is a transpose, so the same function
// converts in both directions; nothing else in nucleate touches spglib's layout.
void TransposeInto(const double in[3][3], double out[3][3]) {
  for (int i = 0; i < 3; ++i)
    for (int j = 0; j < 3; ++j) out[i][j] = in[j][i];
}

void ToSpglib(const Eigen::Matrix3d& rows, double out[3][3]) {
  double tmp[3][3];
  for (int i = 0; i < 3; ++i)
    for (int j = 0; j < 3; ++j) tmp[i][j] = rows(i, j);
  TransposeInto(tmp, out);
}

Eigen::Matrix3d FromSpglib(const double in[3][3]) {
  double tmp[3][3];
  TransposeInto(in, tmp);
  Eigen::Matrix3d rows;
  for (int i = 0; i < 3; ++i)
    for (int j = 0; j < 3; ++j) rows(i, j) = tmp[i][j];
  return rows;
}

// Into [0, 1). x - floor(x) can round to exactly 1 for tiny negative x; that is 0 on the torus.
double Wrap(double x) {
  double w = x - std::floor(x);
  return w >= 1.0 ? 0.0 : w;
}

Eigen::Vector3d WrapVector(const double v[3]) {
  return Eigen::Vector3d(Wrap(v[0]), Wrap(v[1]), Wrap(v[2]));
}

std::string Format(double value) {
  std::ostringstream out;
  out.precision(6);
  out << value;
  return out.str();
}

void ValidateTolerance(const char* field, double value) {
  if (!std::isfinite(value) || value <= 0)
    throw InvalidArgument(field, "must be a finite positive number (angstrom), got " +
                                     Format(value));
}

void ValidateAngleTolerance(double value) {
  // Negative means spglib's default; only NaN and infinity are meaningless.
  if (!std::isfinite(value))
    throw InvalidArgument("angle_tolerance",
                          "must be finite (negative selects spglib's default), got " +
                              Format(value));
}

void ValidateLattice(const Eigen::Matrix3d& lattice) {
  if (!lattice.allFinite())
    throw InvalidArgument("lattice", "holds a NaN or infinite component");
  const double volume = std::abs(lattice.determinant());
  const double lengths =
      lattice.row(0).norm() * lattice.row(1).norm() * lattice.row(2).norm();
  if (!std::isfinite(volume) || !std::isfinite(lengths))
    throw InvalidArgument("lattice", "cell vectors are too long: the volume overflows");
  if (volume < kMinVolume || volume < kMinFlatness * lengths)
    throw InvalidArgument("lattice", "cell vectors are (nearly) coplanar: volume " +
                                         Format(volume) + " angstrom^3");
}

// Copies of the cell in spglib's layout, with buffers `capacity` atoms long (spglib's
// standardisation writes up to 4x the input atoms into the same arrays).
struct SpglibCell {
  double lattice[3][3];
  std::vector<double> positions;  // 3 per atom
  std::vector<int> types;

  SpglibCell(const Crystal& cell, std::size_t capacity)
      : positions(3 * capacity, 0.0), types(capacity, 0) {
    ToSpglib(cell.lattice, lattice);
    for (std::size_t i = 0; i < cell.size(); ++i) {
      for (int k = 0; k < 3; ++k) positions[3 * i + k] = Wrap(cell.frac[i][k]);
      types[i] = cell.numbers[i];
    }
  }
  double (*Positions())[3] { return reinterpret_cast<double(*)[3]>(positions.data()); }
};

// The message for spglib's current error; call with the mutex held.
std::string LastSpglibError() {
  const SpglibError code = spg_get_error_code();
  const char* message = spg_get_error_message(code);
  return message != nullptr ? std::string(message) : "unknown spglib error";
}

std::string NoSymmetryMessage(const char* what, double symprec, double angle_tolerance,
                              const std::string& spglib_message) {
  std::string text = std::string(what) + " found no space group at symprec = " +
                     Format(symprec) + " angstrom";
  if (angle_tolerance >= 0) text += ", angle_tolerance = " + Format(angle_tolerance) + " deg";
  return text + " (spglib: " + spglib_message + ")";
}

// Releases spglib's dataset on every path out of GetDataset, including exceptions. Under the
// mutex like every other spglib call; the owner is always destroyed after the lock it was filled
// under has been released, so this cannot deadlock.
struct DatasetDeleter {
  void operator()(SpglibDataset* d) const {
    if (d == nullptr) return;
    std::lock_guard<std::mutex> lock(SpglibMutex());
    spg_free_dataset(d);
  }
};

// spglib's fixed-size char arrays are NUL-terminated, but copy at most their size regardless.
template <std::size_t N>
std::string CopyString(const char (&text)[N]) {
  return std::string(text, std::find(text, text + N, '\0'));
}

Eigen::Matrix3d ReduceLattice(const Eigen::Matrix3d& rows, double eps, bool niggli) {
  ValidateLattice(rows);
  ValidateTolerance("eps", eps);
  double lattice[3][3];
  ToSpglib(rows, lattice);
  int ok = 0;
  std::string message;
  {
    std::lock_guard<std::mutex> lock(SpglibMutex());
    ok = niggli ? spg_niggli_reduce(lattice, eps) : spg_delaunay_reduce(lattice, eps);
    if (ok == 0) message = LastSpglibError();
  }
  if (ok == 0)
    throw Numerical("eps", std::string(niggli ? "Niggli" : "Delaunay") +
                               " reduction failed at eps = " + Format(eps) + " (spglib: " +
                               message + ")");
  Eigen::Matrix3d reduced = FromSpglib(lattice);
  if (!reduced.allFinite()) throw Internal("spglib returned a non-finite reduced lattice");
  return reduced;
}

}  // namespace

void ValidateCell(const Crystal& cell) {
  ValidateLattice(cell.lattice);
  if (cell.numbers.empty()) throw InvalidArgument("numbers", "the structure holds no atoms");
  if (cell.frac.size() != cell.numbers.size())
    throw InvalidArgument("frac", "has " + std::to_string(cell.frac.size()) +
                                      " positions for " + std::to_string(cell.numbers.size()) +
                                      " atomic numbers");
  // spglib counts atoms in int and standardisation needs 4x the input: stay far below INT_MAX.
  if (static_cast<std::int64_t>(cell.size()) > structure::StructureLimits::kCeilingMaxAtoms)
    throw LimitExceeded("numbers", "more than " +
                                       std::to_string(structure::StructureLimits::kCeilingMaxAtoms) +
                                       " atoms");
  for (std::size_t i = 0; i < cell.size(); ++i)
    if (!cell.frac[i].allFinite())
      throw InvalidArgument("frac[" + std::to_string(i) + "]", "holds a NaN or infinite value");
}

Dataset GetDataset(const Crystal& cell, double symprec, double angle_tolerance) {
  ValidateCell(cell);
  ValidateTolerance("symprec", symprec);
  ValidateAngleTolerance(angle_tolerance);
  SpglibCell in(cell, cell.size());
  const int n = static_cast<int>(cell.size());

  std::unique_ptr<SpglibDataset, DatasetDeleter> raw;
  std::string message;
  {
    std::lock_guard<std::mutex> lock(SpglibMutex());
    raw.reset(spgat_get_dataset(in.lattice, in.Positions(), in.types.data(), n, symprec,
                                angle_tolerance));
    if (raw == nullptr || raw->spacegroup_number == 0) message = LastSpglibError();
  }
  if (raw == nullptr || raw->spacegroup_number == 0)
    throw Numerical("symprec", NoSymmetryMessage("symmetry search", symprec, angle_tolerance,
                                                 message));
  if (raw->n_atoms != n || raw->n_operations < 1 || raw->n_std_atoms < 1)
    throw Internal("spglib returned an inconsistent dataset");

  Dataset d;
  d.number = raw->spacegroup_number;
  d.hall_number = raw->hall_number;
  d.international_symbol = CopyString(raw->international_symbol);
  d.hall_symbol = CopyString(raw->hall_symbol);
  d.choice = CopyString(raw->choice);
  d.point_group = CopyString(raw->pointgroup_symbol);
  for (int i = 0; i < 3; ++i) {
    d.origin_shift[i] = raw->origin_shift[i];
    // transformation_matrix and std_rotation_matrix are operators on column vectors, not lattices:
    // they are copied element for element, not transposed.
    for (int j = 0; j < 3; ++j) {
      d.transformation_matrix(i, j) = raw->transformation_matrix[i][j];
      d.std_rotation_matrix(i, j) = raw->std_rotation_matrix[i][j];
    }
  }
  d.rotations.resize(raw->n_operations);
  d.translations.resize(raw->n_operations);
  for (int k = 0; k < raw->n_operations; ++k) {
    for (int i = 0; i < 3; ++i) {
      d.translations[k][i] = raw->translations[k][i];
      for (int j = 0; j < 3; ++j) d.rotations[k](i, j) = raw->rotations[k][i][j];
    }
  }
  d.wyckoffs.resize(n);
  d.site_symmetry_symbols.resize(n);
  d.equivalent_atoms.assign(raw->equivalent_atoms, raw->equivalent_atoms + n);
  d.crystallographic_orbits.assign(raw->crystallographic_orbits,
                                   raw->crystallographic_orbits + n);
  d.mapping_to_primitive.assign(raw->mapping_to_primitive, raw->mapping_to_primitive + n);
  for (int i = 0; i < n; ++i) {
    // spglib numbers Wyckoff positions 0, 1, ... for the letters a, b, ...
    if (raw->wyckoffs[i] < 0 || raw->wyckoffs[i] > 25)
      throw Internal("spglib returned Wyckoff index " + std::to_string(raw->wyckoffs[i]));
    d.wyckoffs[i] = static_cast<char>('a' + raw->wyckoffs[i]);
    d.site_symmetry_symbols[i] = CopyString(raw->site_symmetry_symbols[i]);
  }
  d.primitive_lattice = FromSpglib(raw->primitive_lattice);
  d.standardized.lattice = FromSpglib(raw->std_lattice);
  d.standardized.label = cell.label;
  d.standardized.numbers.assign(raw->std_types, raw->std_types + raw->n_std_atoms);
  d.standardized.frac.resize(raw->n_std_atoms);
  for (int i = 0; i < raw->n_std_atoms; ++i)
    d.standardized.frac[i] = WrapVector(raw->std_positions[i]);
  d.std_mapping_to_primitive.assign(raw->std_mapping_to_primitive,
                                    raw->std_mapping_to_primitive + raw->n_std_atoms);
  return d;
}

Crystal StandardizeCell(const Crystal& cell, bool to_primitive, bool no_idealize,
                        double symprec, double angle_tolerance) {
  ValidateCell(cell);
  ValidateTolerance("symprec", symprec);
  ValidateAngleTolerance(angle_tolerance);
  // spglib's header: the arrays must have room for 4x the input atoms (an F-centred conventional
  // cell built from a primitive input).
  SpglibCell io(cell, 4 * cell.size());
  int count = 0;
  std::string message;
  {
    std::lock_guard<std::mutex> lock(SpglibMutex());
    count = spgat_standardize_cell(io.lattice, io.Positions(), io.types.data(),
                                   static_cast<int>(cell.size()), to_primitive ? 1 : 0,
                                   no_idealize ? 1 : 0, symprec, angle_tolerance);
    if (count <= 0) message = LastSpglibError();
  }
  if (count <= 0)
    throw Numerical("symprec", NoSymmetryMessage(to_primitive ? "primitive standardisation"
                                                              : "conventional standardisation",
                                                 symprec, angle_tolerance, message));
  if (static_cast<std::size_t>(count) > 4 * cell.size())
    throw Internal("spglib wrote more atoms than its documented bound");
  Crystal out;
  out.label = cell.label;
  out.lattice = FromSpglib(io.lattice);
  out.numbers.assign(io.types.begin(), io.types.begin() + count);
  out.frac.resize(count);
  for (int i = 0; i < count; ++i) out.frac[i] = WrapVector(io.Positions()[i]);
  return out;
}

Eigen::Matrix3d NiggliReduceLattice(const Eigen::Matrix3d& lattice_rows, double eps) {
  return ReduceLattice(lattice_rows, eps, /*niggli=*/true);
}

Eigen::Matrix3d DelaunayReduceLattice(const Eigen::Matrix3d& lattice_rows, double eps) {
  return ReduceLattice(lattice_rows, eps, /*niggli=*/false);
}

SpacegroupType GetSpacegroupType(int hall_number) {
  if (hall_number < 1 || hall_number > 530)
    throw InvalidArgument("hall_number", "must be in 1..530, got " + std::to_string(hall_number));
  SpglibSpacegroupType raw;
  {
    std::lock_guard<std::mutex> lock(SpglibMutex());
    raw = spg_get_spacegroup_type(hall_number);
  }
  if (raw.number == 0) throw Internal("spglib has no entry for Hall number " +
                                      std::to_string(hall_number));
  SpacegroupType t;
  t.number = raw.number;
  t.international_short = CopyString(raw.international_short);
  t.international_full = CopyString(raw.international_full);
  t.schoenflies = CopyString(raw.schoenflies);
  t.hall_symbol = CopyString(raw.hall_symbol);
  t.choice = CopyString(raw.choice);
  t.point_group_international = CopyString(raw.pointgroup_international);
  t.point_group_schoenflies = CopyString(raw.pointgroup_schoenflies);
  return t;
}

}  // namespace nucleate::symmetry::spglib_call
