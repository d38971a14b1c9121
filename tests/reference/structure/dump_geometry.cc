// Prints nucleate's geometry and element results as JSON for the reference scripts beside it.
//
// Usage: dump_geometry CASES.txt   (cases written by the scripts; format below)
//        dump_geometry --elements  (the element table)
//
// CASES.txt is whitespace-separated: the number of cases, then for each case
//   KIND NAME
//   nine lattice numbers (rows a, b, c)
//   N, then N lines "Z fx fy fz"
//   one parameter (the cutoff for KIND "neighbors"; ignored otherwise)
// KIND is "distances" (distance matrix, closest pair, shortest lattice vector, lattice
// parameters, density) or "neighbors" (the full neighbour list within the cutoff).
#include <cmath>
#include <cstdio>
#include <fstream>
#include <iostream>
#include <string>

#include "core/common/error.h"
#include "core/elements/elements.h"
#include "core/structure/density.h"
#include "core/structure/lattice.h"
#include "core/structure/neighbor_list.h"
#include "core/structure/periodic_distances.h"

namespace {

using namespace nucleate;

void Num(double x) {
  if (std::isfinite(x)) {
    std::printf("%.17g", x);
  } else {
    std::printf("null");
  }
}

void PrintElements() {
  std::printf("[\n");
  for (int z = 1; z <= elements::kMaxAtomicNumber; ++z) {
    const elements::Element* e = elements::FindElement(z);
    std::printf("{\"number\": %d, \"symbol\": \"%s\", \"atomic_weight\": ", z, e->symbol);
    Num(e->atomic_weight);
    std::printf(", \"covalent_radius\": ");
    Num(e->covalent_radius);
    std::printf(", \"electronegativity\": ");
    Num(e->electronegativity);
    std::printf(", \"common_oxidation_states\": [");
    for (std::size_t k = 0; k < e->common_oxidation_states.size(); ++k) {
      std::printf("%s%d", k ? ", " : "", e->common_oxidation_states[k]);
    }
    std::printf("], \"radioactive\": %s, \"toxic\": %s}%s\n", e->radioactive ? "true" : "false",
                e->toxic ? "true" : "false", z < elements::kMaxAtomicNumber ? "," : "");
  }
  std::printf("]\n");
}

void PrintDistances(const structure::Crystal& c) {
  const Eigen::MatrixXd d = structure::DistanceMatrix(c);
  std::printf("\"distance_matrix\": [");
  for (Eigen::Index i = 0; i < d.rows(); ++i) {
    std::printf("%s[", i ? ", " : "");
    for (Eigen::Index j = 0; j < d.cols(); ++j) {
      if (j) std::printf(", ");
      Num(d(i, j));
    }
    std::printf("]");
  }
  const structure::ClosestPair p = structure::MinimumInteratomicDistance(c);
  std::printf("], \"min_distance\": ");
  Num(p.distance);
  std::printf(", \"min_pair\": [%zu, %zu], \"shortest_lattice_vector\": ", p.i, p.j);
  Num(structure::MinimumImage(c.lattice).ShortestLatticeVector().distance);
  const structure::LatticeParameters lp = structure::ParametersFromMatrix(c.lattice);
  std::printf(", \"parameters\": [");
  const double values[6] = {lp.a, lp.b, lp.c, lp.alpha, lp.beta, lp.gamma};
  for (int k = 0; k < 6; ++k) {
    if (k) std::printf(", ");
    Num(values[k]);
  }
  const Eigen::Matrix3d standard = structure::MatrixFromParameters(lp);
  std::printf("], \"standard_matrix\": [");
  for (int k = 0; k < 9; ++k) {
    if (k) std::printf(", ");
    Num(standard(k / 3, k % 3));
  }
  std::printf("], \"signed_volume\": ");
  Num(structure::SignedVolume(c.lattice));
  std::printf(", \"density\": ");
  Num(structure::Density(c));
}

void PrintNeighbors(const structure::Crystal& c, double cutoff) {
  std::printf("\"neighbors\": [");
  bool first = true;
  for (const structure::Neighbor& n : structure::NeighborList(c, cutoff)) {
    std::printf("%s[%zu, %zu, %d, %d, %d, ", first ? "" : ", ", n.i, n.j, n.image[0], n.image[1],
                n.image[2]);
    Num(n.distance);
    std::printf("]");
    first = false;
  }
  std::printf("]");
}

int Run(std::istream& in) {
  int cases = 0;
  in >> cases;
  std::printf("[\n");
  for (int k = 0; k < cases; ++k) {
    std::string kind, name;
    structure::Crystal c;
    std::size_t n = 0;
    double parameter = 0;
    in >> kind >> name;
    for (int e = 0; e < 9; ++e) in >> c.lattice(e / 3, e % 3);
    in >> n;
    c.numbers.resize(n);
    c.frac.resize(n);
    for (std::size_t s = 0; s < n; ++s) in >> c.numbers[s] >> c.frac[s][0] >> c.frac[s][1] >> c.frac[s][2];
    in >> parameter;
    if (!in) throw std::runtime_error("malformed case " + std::to_string(k));
    std::printf("{\"name\": \"%s\", \"kind\": \"%s\", ", name.c_str(), kind.c_str());
    if (kind == "distances") {
      PrintDistances(c);
    } else if (kind == "neighbors") {
      PrintNeighbors(c, parameter);
    } else {
      throw std::runtime_error("unknown kind " + kind);
    }
    std::printf("}%s\n", k + 1 < cases ? "," : "");
  }
  std::printf("]\n");
  return 0;
}

}  // namespace

int main(int argc, char** argv) {
  try {
    if (argc == 2 && std::string(argv[1]) == "--elements") {
      PrintElements();
      return 0;
    }
    if (argc != 2) {
      std::fprintf(stderr, "usage: dump_geometry CASES.txt | --elements\n");
      return 2;
    }
    std::ifstream in(argv[1]);
    if (!in) {
      std::fprintf(stderr, "dump_geometry: cannot read %s\n", argv[1]);
      return 2;
    }
    return Run(in);
  } catch (const std::exception& e) {
    std::fprintf(stderr, "dump_geometry: %s\n", e.what());
    return 1;
  }
}
