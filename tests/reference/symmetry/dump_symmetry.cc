// Prints, as JSON on stdout, a deterministic set of structures and nucleate's symmetry results
// for them, for symmetry_spglib_reference.py to recompute with Debian's python3-spglib.
// Usage: dump_symmetry [SEED]. The structures: the textbook set, random perturbations, random
// rotations with origin shifts and permutations, random skewed supercells, and random P1 cells,
// all drawn from SEED with std::mt19937_64 (same sequence on every standard library).
#include <cinttypes>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <string>
#include <vector>

#include "core/common/error.h"
#include "core/symmetry/symmetry.h"
#include "tests/unit/symmetry/structure_transforms.h"
#include "tests/unit/symmetry/textbook_structures.h"

namespace {

using nucleate::structure::Crystal;
using namespace nucleate::symmetry;
using namespace nucleate::symmetry::testing;

struct Case {
  std::string name;
  Crystal crystal;
  double symprec;
};

void PrintMatrix(const Eigen::Matrix3d& m) {
  std::printf("[");
  for (int i = 0; i < 3; ++i)
    std::printf("%s[%.17g, %.17g, %.17g]", i ? ", " : "", m(i, 0), m(i, 1), m(i, 2));
  std::printf("]");
}

void PrintCell(const Crystal& c) {
  std::printf("{\"lattice\": ");
  PrintMatrix(c.lattice);
  std::printf(", \"positions\": [");
  for (std::size_t i = 0; i < c.size(); ++i)
    std::printf("%s[%.17g, %.17g, %.17g]", i ? ", " : "", c.frac[i][0], c.frac[i][1],
                c.frac[i][2]);
  std::printf("], \"numbers\": [");
  for (std::size_t i = 0; i < c.size(); ++i) std::printf("%s%d", i ? ", " : "", c.numbers[i]);
  std::printf("]}");
}

void PrintInts(const std::vector<int>& v) {
  std::printf("[");
  for (std::size_t i = 0; i < v.size(); ++i) std::printf("%s%d", i ? ", " : "", v[i]);
  std::printf("]");
}

// JSON-safe: names and spglib symbols hold no quotes or backslashes, but escape anyway.
std::string Quoted(const std::string& s) {
  std::string out = "\"";
  for (char ch : s) {
    if (ch == '"' || ch == '\\') out += '\\';
    out += ch;
  }
  return out + "\"";
}

void PrintCase(const Case& k, bool first) {
  std::printf("%s\n  {\"name\": %s, \"symprec\": %.17g, \"cell\": ", first ? "" : ",",
              Quoted(k.name).c_str(), k.symprec);
  PrintCell(k.crystal);
  try {
    const SymmetryInfo info = AnalyseSymmetry(k.crystal, k.symprec);
    std::printf(",\n   \"number\": %d, \"hall_number\": %d, \"international\": %s", info.number,
                info.hall_number, Quoted(info.international).c_str());
    std::printf(", \"crystal_system\": %s",
                Quoted(CrystalSystemName(info.crystal_system)).c_str());
    std::printf(", \"wyckoffs\": %s",
                Quoted(std::string(info.wyckoffs.begin(), info.wyckoffs.end())).c_str());
    std::printf(", \"equivalent_atoms\": ");
    PrintInts(info.equivalent_atoms);
    std::printf(", \"n_operations\": %zu", info.operations.size());
    std::printf(", \"primitive_volume\": %.17g", info.PrimitiveVolume());
    const Crystal primitive = StandardPrimitiveCell(k.crystal, k.symprec, -1, true);
    std::printf(",\n   \"primitive_cell\": ");
    PrintCell(primitive);
    const Crystal conventional = Symmetrise(k.crystal, k.symprec);
    std::printf(",\n   \"symmetrised_cell\": ");
    PrintCell(conventional);
    const Crystal niggli = NiggliReduce(k.crystal);
    std::printf(",\n   \"niggli_lattice\": ");
    PrintMatrix(niggli.lattice);
  } catch (const nucleate::Error& e) {
    std::printf(", \"error\": %s", Quoted(e.what()).c_str());
  }
  std::printf("}");
}

std::vector<Case> MakeCases(std::uint64_t seed) {
  std::vector<Case> cases;
  Uniform u(seed);
  const std::vector<Textbook> book = TextbookStructures();
  for (const auto& t : book) cases.push_back({t.name, t.crystal, 0.1});
  // Perturbations at several sizes and tolerances: some stay in the group, some fall out of it.
  for (const auto& t : book)
    for (double amplitude : {0.01, 0.03, 0.08})
      for (double symprec : {0.01, 0.1})
        cases.push_back({t.name + " perturbed " + std::to_string(amplitude) + " A",
                         Perturb(t.crystal, amplitude, static_cast<std::uint64_t>(
                                                           u.Next() * 1e15)),
                         symprec});
  // Rotated frame, shifted origin, permuted atoms.
  for (const auto& t : book) {
    const Eigen::Vector3d axis(u.Next() - 0.5, u.Next() - 0.5, u.Next() - 0.5);
    Crystal c = RotateFrame(t.crystal, AxisAngle(axis, 6.283185307179586 * u.Next()));
    c = Translate(c, Eigen::Vector3d(u.Next(), u.Next(), u.Next()));
    c = Permute(c, static_cast<std::uint64_t>(u.Next() * 1e15));
    cases.push_back({t.name + " rotated/shifted/permuted", c, 0.1});
  }
  // Random skewed supercells of the small structures: entries in -2..2, determinant 1..4.
  int made = 0;
  while (made < 30) {
    const Textbook& t = book[u.Below(static_cast<int>(book.size()))];
    if (t.crystal.size() > 12) continue;
    Eigen::Matrix3i m;
    for (int i = 0; i < 3; ++i)
      for (int j = 0; j < 3; ++j) m(i, j) = u.Below(5) - 2;
    const long det = std::lround(m.cast<double>().determinant());
    if (det < 1 || det > 4) continue;
    Crystal c = Supercell(t.crystal, m);
    c = Perturb(c, 0.005, static_cast<std::uint64_t>(u.Next() * 1e15));
    cases.push_back({t.name + " supercell det " + std::to_string(det), c, 0.1});
    ++made;
  }
  // Random cells with no symmetry to speak of.
  for (int k = 0; k < 10; ++k) {
    Crystal c;
    c.lattice = LatticeFromParameters(4 + 3 * u.Next(), 4 + 3 * u.Next(), 4 + 3 * u.Next(),
                                      70 + 40 * u.Next(), 70 + 40 * u.Next(), 70 + 40 * u.Next());
    const int n = 2 + u.Below(8);
    for (int i = 0; i < n; ++i) {
      c.numbers.push_back(1 + u.Below(3));
      c.frac.emplace_back(u.Next(), u.Next(), u.Next());
    }
    cases.push_back({"random P1 #" + std::to_string(k), c, 0.01});
  }
  // Cells spglib refuses (same species closer than symprec): both sides must report failure.
  for (double gap : {0.02, 0.05}) {
    Crystal c;
    c.lattice = LatticeFromParameters(4.1, 4.3, 4.7, 90, 95, 90);
    c.numbers = {26, 26, 8};
    c.frac = {Eigen::Vector3d(0.2, 0.3, 0.4), Eigen::Vector3d(0.2 + gap / 4.1, 0.3, 0.4),
              Eigen::Vector3d(0.7, 0.6, 0.1)};
    cases.push_back({"overlapping atoms " + std::to_string(gap) + " A", c, 0.1});
  }
  return cases;
}

}  // namespace

int main(int argc, char** argv) {
  const std::uint64_t seed = argc > 1 ? std::strtoull(argv[1], nullptr, 10) : 20240601u;
  const std::vector<Case> cases = MakeCases(seed);
  std::printf("{\"seed\": %" PRIu64 ", \"cases\": [", seed);
  for (std::size_t i = 0; i < cases.size(); ++i) PrintCase(cases[i], i == 0);
  std::printf("\n]}\n");
  return 0;
}
