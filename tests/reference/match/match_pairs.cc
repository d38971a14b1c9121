// Reads structure pairs written by match_reference.py and prints nucleate's verdict for each:
//   <index> <match 0|1> <rms> <max> <screen 0|1> <reason>
// where screen says whether dedup's screen (same fingerprint key, then the exact lattice screen of
// core/match/lattice_index.h) would let the pair be compared at all.
// The JSON is the script's own fixed layout ({"pairs": [{"a": S, "b": S}, ...]} with
// S = {"lattice": [9 numbers, rows], "numbers": [...], "frac": [3N numbers]}), so a scanner for
// the three flat arrays per structure is enough; anything else is reported as a parse error.
#include <cstdio>
#include <fstream>
#include <iostream>
#include <sstream>
#include <string>
#include <vector>

#include "core/common/error.h"
#include "core/match/fingerprint.h"
#include "core/match/lattice_index.h"
#include "core/match/prepared_crystal.h"
#include "core/match/structure_matcher.h"

namespace {

using nucleate::structure::Crystal;

// The flat numeric array following "key": at or after `pos`; advances pos past it.
bool ReadArray(const std::string& text, const std::string& key, std::size_t* pos,
               std::vector<double>* out) {
  const std::size_t k = text.find("\"" + key + "\"", *pos);
  if (k == std::string::npos) return false;
  const std::size_t open = text.find('[', k);
  const std::size_t close = text.find(']', open);
  if (open == std::string::npos || close == std::string::npos) return false;
  std::string body = text.substr(open + 1, close - open - 1);
  for (char& ch : body) {
    if (ch == ',') ch = ' ';
  }
  std::istringstream in(body);
  out->clear();
  double x;
  while (in >> x) out->push_back(x);
  *pos = close + 1;
  return true;
}

bool ReadCrystal(const std::string& text, std::size_t* pos, Crystal* c) {
  std::vector<double> lattice, numbers, frac;
  if (!ReadArray(text, "lattice", pos, &lattice) || !ReadArray(text, "numbers", pos, &numbers) ||
      !ReadArray(text, "frac", pos, &frac) || lattice.size() != 9 ||
      frac.size() != 3 * numbers.size()) {
    return false;
  }
  for (int i = 0; i < 3; ++i)
    for (int j = 0; j < 3; ++j) c->lattice(i, j) = lattice[3 * i + j];
  c->numbers.clear();
  c->frac.clear();
  for (std::size_t s = 0; s < numbers.size(); ++s) {
    c->numbers.push_back(static_cast<int>(numbers[s]));
    c->frac.emplace_back(frac[3 * s], frac[3 * s + 1], frac[3 * s + 2]);
  }
  return true;
}

}  // namespace

int main(int argc, char** argv) {
  if (argc != 2) {
    std::cerr << "usage: match_pairs pairs.json\n";
    return 2;
  }
  std::ifstream file(argv[1]);
  std::stringstream buffer;
  buffer << file.rdbuf();
  const std::string text = buffer.str();
  std::size_t pos = 0;
  for (int index = 0;; ++index) {
    Crystal a, b;
    const std::size_t before = pos;
    if (!ReadCrystal(text, &pos, &a)) {
      if (text.find("\"lattice\"", before) != std::string::npos) {
        std::cerr << "parse error in pair " << index << "\n";
        return 1;
      }
      break;
    }
    if (!ReadCrystal(text, &pos, &b)) {
      std::cerr << "parse error in pair " << index << " (b)\n";
      return 1;
    }
    try {
      namespace m = nucleate::match;
      const m::MatchTolerances t;
      const auto r = m::MatchStructures(a, b, t);
      // As dedup runs it: a (the structure looked up) is the mover, b (a stored one) the target.
      const m::PreparedCrystal pa = m::Prepare(a, t), pb = m::Prepare(b, t);
      const bool screen =
          m::ComputeFingerprint(pa, t).key == m::ComputeFingerprint(pb, t).key &&
          m::LatticeScreenPasses(pa.lattice, pb.lattice, t.length_tolerance, t.angle_tolerance);
      std::printf("%d %d %.10g %.10g %d %s\n", index, r.match ? 1 : 0, r.rms, r.max_displacement,
                  screen ? 1 : 0, r.reason.c_str());
    } catch (const nucleate::Error& e) {
      std::printf("%d error nan nan 0 %s\n", index, e.what());
    }
  }
  return 0;
}
