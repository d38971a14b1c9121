#include "tests/unit/symmetry/textbook_structures.h"

#include <cctype>
#include <cmath>
#include <stdexcept>

namespace nucleate::symmetry::testing {
namespace {

using structure::Crystal;
using V = Eigen::Vector3d;

constexpr double kPi = 3.14159265358979323846;

double Wrap(double x) {
  const double w = x - std::floor(x);
  return w >= 1.0 - 1e-12 ? 0.0 : w;
}

// One coordinate expression: sum of terms like -x, 2y, +1/2, 0.25.
double EvaluateCoordinate(const std::string& text, double x, double y, double z) {
  double value = 0;
  std::size_t i = 0;
  bool any = false;
  while (i < text.size()) {
    double sign = 1;
    while (i < text.size() && (text[i] == '+' || text[i] == '-' || text[i] == ' ')) {
      if (text[i] == '-') sign = -sign;
      ++i;
    }
    if (i >= text.size()) throw std::invalid_argument("dangling sign in '" + text + "'");
    std::size_t start = i;
    while (i < text.size() && (std::isdigit(static_cast<unsigned char>(text[i])) || text[i] == '.'))
      ++i;
    double number = start < i ? std::stod(text.substr(start, i - start)) : 1.0;
    if (i < text.size() && text[i] == '/') {
      ++i;
      std::size_t den_start = i;
      while (i < text.size() && std::isdigit(static_cast<unsigned char>(text[i]))) ++i;
      if (den_start == i) throw std::invalid_argument("bad fraction in '" + text + "'");
      number /= std::stod(text.substr(den_start, i - den_start));
    } else if (i < text.size() && (text[i] == 'x' || text[i] == 'y' || text[i] == 'z')) {
      number *= text[i] == 'x' ? x : text[i] == 'y' ? y : z;
      ++i;
    } else if (start == i) {
      throw std::invalid_argument("cannot read '" + text + "'");
    }
    value += sign * number;
    any = true;
  }
  if (!any) throw std::invalid_argument("empty coordinate");
  return value;
}

const std::vector<V> kP = {V(0, 0, 0)};
const std::vector<V> kI = {V(0, 0, 0), V(0.5, 0.5, 0.5)};
const std::vector<V> kF = {V(0, 0, 0), V(0, 0.5, 0.5), V(0.5, 0, 0.5), V(0.5, 0.5, 0)};
// Rhombohedral centring in the hexagonal (obverse) setting, ITA Vol. A.
const std::vector<V> kR = {V(0, 0, 0), V(2.0 / 3, 1.0 / 3, 1.0 / 3), V(1.0 / 3, 2.0 / 3, 2.0 / 3)};

Eigen::Matrix3d Cubic(double a) { return LatticeFromParameters(a, a, a, 90, 90, 90); }
Eigen::Matrix3d Hexagonal(double a, double c) { return LatticeFromParameters(a, a, c, 90, 90, 120); }
Eigen::Matrix3d Tetragonal(double a, double c) { return LatticeFromParameters(a, a, c, 90, 90, 90); }

// Coordinate triplets of the Wyckoff positions used below, as listed in the International Tables
// for Crystallography Vol. A (space-group tables), centring translations omitted.
const std::vector<std::string> kOrigin = {"0,0,0"};
const std::vector<std::string> kBodyCentre = {"1/2,1/2,1/2"};

}  // namespace

Eigen::Matrix3d LatticeFromParameters(double a, double b, double c, double alpha, double beta,
                                      double gamma) {
  const double ca = std::cos(alpha * kPi / 180), cb = std::cos(beta * kPi / 180);
  const double cg = std::cos(gamma * kPi / 180), sg = std::sin(gamma * kPi / 180);
  const double cx = c * cb;
  const double cy = c * (ca - cb * cg) / sg;
  const double cz = std::sqrt(c * c - cx * cx - cy * cy);
  Eigen::Matrix3d l;
  l << a, 0, 0, b * cg, b * sg, 0, cx, cy, cz;
  return l;
}

Eigen::Vector3d EvaluateTriplet(const std::string& triplet, double x, double y, double z) {
  V out;
  std::size_t start = 0;
  for (int k = 0; k < 3; ++k) {
    const std::size_t comma = triplet.find(',', start);
    if ((k < 2) == (comma == std::string::npos))
      throw std::invalid_argument("triplet needs three comma-separated parts: " + triplet);
    out[k] = EvaluateCoordinate(triplet.substr(start, comma - start), x, y, z);
    start = comma + 1;
  }
  return out;
}

Crystal BuildFromWyckoff(const Eigen::Matrix3d& lattice, const std::vector<V>& centring,
                         const std::vector<WyckoffSite>& sites, const std::string& label) {
  Crystal c;
  c.lattice = lattice;
  c.label = label;
  for (const auto& site : sites) {
    std::vector<V> expanded;
    for (const auto& t : site.triplets) {
      const V p = EvaluateTriplet(t, site.x, site.y, site.z);
      for (const auto& shift : centring) {
        const V q = p + shift;
        V w(Wrap(q[0]), Wrap(q[1]), Wrap(q[2]));
        bool seen = false;
        for (const auto& e : expanded) {
          V d = w - e;
          for (int k = 0; k < 3; ++k) d[k] -= std::round(d[k]);
          if (d.norm() < 1e-6) seen = true;
        }
        if (!seen) expanded.push_back(w);
      }
    }
    if (static_cast<int>(expanded.size()) != site.multiplicity)
      throw std::logic_error(label + ": a site of Z=" + std::to_string(site.number) +
                             " expands to " + std::to_string(expanded.size()) +
                             " positions, the Tables give " + std::to_string(site.multiplicity));
    for (const auto& p : expanded) {
      c.numbers.push_back(site.number);
      c.frac.push_back(p);
    }
  }
  return c;
}

std::vector<Textbook> TextbookStructures() {
  std::vector<Textbook> out;
  const std::string ita = "positions: International Tables for Crystallography Vol. A, ";
  // Lattice constants and free parameters below are typed from memory (close to the values in
  // handbooks such as Wyckoff, Crystal Structures); the space group does not depend on them.

  out.push_back({"NaCl rock salt",
                 BuildFromWyckoff(Cubic(5.640), kF,
                                  {{11, 4, kOrigin}, {17, 4, kBodyCentre}}, "NaCl"),
                 225, "Fm-3m", {"11:a 17:b", "11:b 17:a"},
                 ita + "No. 225 (4a, 4b); a from memory"});

  // Fd-3m origin choice 2 (origin at -3m): 8a = 1/8,1/8,1/8; 7/8,3/8,3/8.
  out.push_back({"Si diamond",
                 BuildFromWyckoff(Cubic(5.431), kF,
                                  {{14, 8, {"1/8,1/8,1/8", "7/8,3/8,3/8"}}}, "Si"),
                 227, "Fd-3m", {"14:a", "14:b"},
                 ita + "No. 227 origin choice 2 (8a); a = 5.431 A from memory"});

  out.push_back({"CsCl",
                 BuildFromWyckoff(Cubic(4.123), kP, {{55, 1, kOrigin}, {17, 1, kBodyCentre}},
                                  "CsCl"),
                 221, "Pm-3m", {"17:b 55:a", "17:a 55:b"},
                 ita + "No. 221 (1a, 1b); a from memory"});

  // F-43m: 4a 0,0,0; 4c 1/4,1/4,1/4. The normaliser's shifts by 1/4 along the body diagonal and
  // the inversion relabel a, b, c, d: every pair with Zn and S a quarter diagonal apart.
  out.push_back({"ZnS zincblende",
                 BuildFromWyckoff(Cubic(5.409), kF, {{30, 4, kOrigin}, {16, 4, {"1/4,1/4,1/4"}}},
                                  "ZnS"),
                 216, "F-43m",
                 {"16:c 30:a", "16:d 30:b", "16:a 30:d", "16:b 30:c", "16:d 30:a", "16:c 30:b",
                  "16:a 30:c", "16:b 30:d"},
                 ita + "No. 216 (4a, 4c); a from memory"});

  // P6_3mc 2b: 1/3,2/3,z; 2/3,1/3,z+1/2.
  const std::vector<std::string> k2b_186 = {"1/3,2/3,z", "2/3,1/3,z+1/2"};
  {
    WyckoffSite zn{30, 2, k2b_186};
    WyckoffSite o{8, 2, k2b_186};
    o.z = 0.382;
    out.push_back({"ZnO wurtzite", BuildFromWyckoff(Hexagonal(3.250, 5.207), kP, {zn, o}, "ZnO"),
                   186, "P6_3mc", {"8:b 30:b"},
                   ita + "No. 186 (2b); a, c and u = 0.382 from memory"});
  }

  // P4_2/mnm: 2a 0,0,0; 1/2,1/2,1/2. 4f x,x,0; -x,-x,0; -x+1/2,x+1/2,1/2; x+1/2,-x+1/2,1/2.
  {
    WyckoffSite o{8, 4, {"x,x,0", "-x,-x,0", "-x+1/2,x+1/2,1/2", "x+1/2,-x+1/2,1/2"}};
    o.x = 0.305;
    out.push_back({"TiO2 rutile",
                   BuildFromWyckoff(Tetragonal(4.594, 2.959), kP,
                                    {{22, 2, {"0,0,0", "1/2,1/2,1/2"}}, o}, "TiO2"),
                   136, "P4_2/mnm", {"8:f 22:a", "8:g 22:b"},
                   ita + "No. 136 (2a, 4f); a, c and x = 0.305 from memory"});
  }

  out.push_back({"SrTiO3 cubic perovskite",
                 BuildFromWyckoff(Cubic(3.905), kP,
                                  {{38, 1, kOrigin},
                                   {22, 1, kBodyCentre},
                                   {8, 3, {"0,1/2,1/2", "1/2,0,1/2", "1/2,1/2,0"}}},
                                  "SrTiO3"),
                 221, "Pm-3m", {"8:c 22:b 38:a", "8:d 22:a 38:b"},
                 ita + "No. 221 (1a, 1b, 3c); a from memory"});

  out.push_back({"CaF2 fluorite",
                 BuildFromWyckoff(Cubic(5.463), kF,
                                  {{20, 4, kOrigin}, {9, 8, {"1/4,1/4,1/4", "1/4,1/4,3/4"}}},
                                  "CaF2"),
                 225, "Fm-3m", {"9:c 20:a", "9:c 20:b"},
                 ita + "No. 225 (4a, 8c); a from memory"});

  // R-3c, hexagonal axes: 12c 0,0,z; 0,0,-z+1/2; 0,0,-z; 0,0,z+1/2.
  // 18e x,0,1/4; 0,x,1/4; -x,-x,1/4; -x,0,3/4; 0,-x,3/4; x,x,3/4.
  {
    WyckoffSite al{13, 12, {"0,0,z", "0,0,-z+1/2", "0,0,-z", "0,0,z+1/2"}};
    al.z = 0.352;
    WyckoffSite o{8, 18, {"x,0,1/4", "0,x,1/4", "-x,-x,1/4", "-x,0,3/4", "0,-x,3/4", "x,x,3/4"}};
    o.x = 0.306;
    out.push_back({"Al2O3 corundum",
                   BuildFromWyckoff(Hexagonal(4.759, 12.991), kR, {al, o}, "Al2O3"), 167, "R-3c",
                   {"8:e 13:c"},
                   ita + "No. 167 hexagonal axes (12c, 18e); a, c, z = 0.352, x = 0.306 from "
                         "memory"});
  }

  // P6_3/mmc: 2a 0,0,0; 0,0,1/2. 2c 1/3,2/3,1/4; 2/3,1/3,3/4.
  const std::vector<std::string> k2c_194 = {"1/3,2/3,1/4", "2/3,1/3,3/4"};
  out.push_back({"NiAs",
                 BuildFromWyckoff(Hexagonal(3.619, 5.034), kP,
                                  {{28, 2, {"0,0,0", "0,0,1/2"}}, {33, 2, k2c_194}}, "NiAs"),
                 194, "P6_3/mmc", {"28:a 33:c", "28:a 33:d"},
                 ita + "No. 194 (2a, 2c); a, c from memory"});

  out.push_back({"Mg hcp",
                 BuildFromWyckoff(Hexagonal(3.209, 5.211), kP, {{12, 2, k2c_194}}, "Mg"), 194,
                 "P6_3/mmc", {"12:c", "12:d"}, ita + "No. 194 (2c); a, c from memory"});

  out.push_back({"Fe bcc", BuildFromWyckoff(Cubic(2.8665), kI, {{26, 2, kOrigin}}, "Fe"), 229,
                 "Im-3m", {"26:a"}, ita + "No. 229 (2a); a from memory"});

  out.push_back({"Cu fcc", BuildFromWyckoff(Cubic(3.615), kF, {{29, 4, kOrigin}}, "Cu"), 225,
                 "Fm-3m", {"29:a", "29:b"}, ita + "No. 225 (4a); a from memory"});

  // Fd-3m origin choice 2. 8a 1/8,1/8,1/8; 7/8,3/8,3/8. 16d 1/2,1/2,1/2; 1/4,3/4,0; 3/4,0,1/4;
  // 0,1/4,3/4. 32e x,x,x; -x+3/4,-x+1/4,x+1/2; -x+1/4,x+1/2,-x+3/4; x+1/2,-x+3/4,-x+1/4 and their
  // inverses through the origin. The spinel oxygen parameter u = 0.387 is quoted for origin
  // choice 1 (origin at -43m); origin choice 2 is shifted by 1/8,1/8,1/8: x = u - 1/8 = 0.262.
  {
    WyckoffSite o{8, 32,
                  {"x,x,x", "-x+3/4,-x+1/4,x+1/2", "-x+1/4,x+1/2,-x+3/4", "x+1/2,-x+3/4,-x+1/4",
                   "-x,-x,-x", "x+1/4,x+3/4,-x+1/2", "x+3/4,-x+1/2,x+1/4",
                   "-x+1/2,x+1/4,x+3/4"}};
    o.x = 0.387 - 0.125;
    out.push_back({"MgAl2O4 spinel",
                   BuildFromWyckoff(Cubic(8.083), kF,
                                    {{12, 8, {"1/8,1/8,1/8", "7/8,3/8,3/8"}},
                                     {13, 16, {"1/2,1/2,1/2", "1/4,3/4,0", "3/4,0,1/4",
                                               "0,1/4,3/4"}},
                                     o},
                                    "MgAl2O4"),
                   227, "Fd-3m", {"8:e 12:a 13:d", "8:e 12:b 13:c"},
                   ita + "No. 227 origin choice 2 (8a, 16d, 32e); a and u = 0.387 from memory"});
  }

  // Tetragonal ferroelectric BaTiO3, P4mm: 1a 0,0,z; 1b 1/2,1/2,z; 2c 1/2,0,z; 0,1/2,z.
  {
    WyckoffSite ti{22, 1, {"1/2,1/2,z"}}, o1{8, 1, {"1/2,1/2,z"}}, o2{8, 2, {"1/2,0,z", "0,1/2,z"}};
    ti.z = 0.515;
    o1.z = -0.025;
    o2.z = 0.486;
    out.push_back({"BaTiO3 tetragonal",
                   BuildFromWyckoff(Tetragonal(3.992, 4.036), kP, {{56, 1, kOrigin}, ti, o1, o2},
                                    "BaTiO3"),
                   99, "P4mm", {"8:b 8:c 22:b 56:a", "8:a 8:c 22:a 56:b"},
                   ita + "No. 99 (1a, 1b, 1b, 2c); a, c and z from memory"});
  }

  // A CaTiO3-type perovskite strained to c/a = 1.06 without tilts (c - a = 0.23 A,
  // well above symprec = 0.1 A) (hypothetical), P4/mmm:
  // 1a 0,0,0; 1c 1/2,1/2,0; 1d 1/2,1/2,1/2; 2e 0,1/2,1/2; 1/2,0,1/2. Origin shifts by the
  // normaliser's translations relabel a<->c, b<->d and e<->f.
  out.push_back({"CaTiO3-type perovskite, tetragonal strain",
                 BuildFromWyckoff(Tetragonal(3.85, 3.85 * 1.06), kP,
                                  {{20, 1, kOrigin},
                                   {22, 1, kBodyCentre},
                                   {8, 1, {"1/2,1/2,0"}},
                                   {8, 2, {"0,1/2,1/2", "1/2,0,1/2"}}},
                                  "CaTiO3-tetragonal"),
                 123, "P4/mmm",
                 {"8:c 8:e 20:a 22:d", "8:a 8:e 20:c 22:b", "8:d 8:f 20:b 22:c",
                  "8:b 8:f 20:d 22:a"},
                 ita + "No. 123 (1a, 1c, 1d, 2e); parameters invented for the test"});

  // A generic monoclinic arrangement, P2_1/c (unique axis b, cell choice 1), general position
  // 4e: x,y,z; -x,y+1/2,-z+1/2; -x,-y,-z; x,-y+1/2,z+1/2.
  {
    const std::vector<std::string> k4e = {"x,y,z", "-x,y+1/2,-z+1/2", "-x,-y,-z",
                                          "x,-y+1/2,z+1/2"};
    WyckoffSite s1{14, 4, k4e}, s2{8, 4, k4e}, s3{8, 4, k4e};
    s1.x = 0.11, s1.y = 0.23, s1.z = 0.37;
    s2.x = 0.31, s2.y = 0.07, s2.z = 0.19;
    s3.x = 0.62, s3.y = 0.41, s3.z = 0.83;
    out.push_back({"monoclinic P2_1/c (generic)",
                   BuildFromWyckoff(LatticeFromParameters(5.1, 6.2, 7.3, 90, 103, 90), kP,
                                    {s1, s2, s3}, "P21c-generic"),
                   14, "P2_1/c", {"8:e 8:e 14:e"},
                   ita + "No. 14 (4e); coordinates invented for the test"});
  }

  // A generic triclinic arrangement, P-1: 2i x,y,z; -x,-y,-z.
  {
    WyckoffSite s1{26, 2, {"x,y,z", "-x,-y,-z"}}, s2{16, 2, {"x,y,z", "-x,-y,-z"}};
    s1.x = 0.13, s1.y = 0.27, s1.z = 0.08;
    s2.x = 0.36, s2.y = 0.12, s2.z = 0.41;
    out.push_back({"triclinic P-1 (generic)",
                   BuildFromWyckoff(LatticeFromParameters(5.0, 6.0, 7.0, 81, 97, 104), kP,
                                    {s1, s2}, "P-1-generic"),
                   2, "P-1", {"16:i 26:i"},
                   ita + "No. 2 (2i); coordinates invented for the test"});
  }

  // No symmetry but the identity: P1, every site 1a.
  out.push_back({"triclinic P1 (generic)",
                 BuildFromWyckoff(LatticeFromParameters(4.4, 5.3, 6.1, 77, 84, 95), kP,
                                  {{6, 1, {"0.05,0.1,0.2"}},
                                   {7, 1, {"0.45,0.33,0.71"}},
                                   {8, 1, {"0.77,0.62,0.13"}}},
                                  "P1-generic"),
                 1, "P1", {"6:a 7:a 8:a"}, ita + "No. 1 (1a); coordinates invented for the test"});
  return out;
}

}  // namespace nucleate::symmetry::testing
