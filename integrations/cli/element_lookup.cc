#include "element_lookup.h"

#include <CLI/CLI.hpp>
#include <cctype>
#include <map>

#include "abi_client.h"
#include "json_reply.h"

namespace nucleate::cli {
namespace {

bool AllDigits(const std::string& text) {
  for (char c : text) {
    if (!std::isdigit(static_cast<unsigned char>(c))) return false;
  }
  return !text.empty();
}

bool AllLetters(const std::string& text) {
  for (char c : text) {
    if (!std::isalpha(static_cast<unsigned char>(c))) return false;
  }
  return !text.empty();
}

// The library reads element symbols in extended XYZ files: one atom in a 10 A cube, converted to
// a Structure, gives the atomic number by the library's own table and spelling rules.
int LookUp(const std::string& symbol) {
  const std::string xyz =
      "1\nLattice=\"10 0 0 0 10 0 0 0 10\" Properties=species:S:1:pos:R:3\n" + symbol + " 0 0 0\n";
  const std::string request = "{\"inputs\":[{\"file\":{\"name\":\"element.xyz\",\"content\":\"" +
                              Base64(xyz) + "\"}}],\"format\":\"STRUCTURE_FORMAT_JSON\"}";
  const YAML::Node reply = ParseJson(CallJson("Convert", request));
  const YAML::Node structures = reply["structures"];
  if (!structures || structures.size() != 1) return 0;
  return structures[0]["atomic_numbers"][0].as<int>();
}

}  // namespace

int AtomicNumber(const std::string& symbol, const std::string& origin) {
  if (AllDigits(symbol)) {
    if (symbol.size() > 3) throw CLI::ValidationError(origin, "no atomic number " + symbol);
    return std::stoi(symbol);
  }
  if (!AllLetters(symbol) || symbol.size() > 3) {
    throw CLI::ValidationError(origin, "'" + symbol + "' is not an element symbol");
  }
  static std::map<std::string, int> known;  // each symbol is asked once per run
  auto found = known.find(symbol);
  if (found == known.end()) found = known.emplace(symbol, LookUp(symbol)).first;
  if (found->second == 0) {
    throw CLI::ValidationError(origin, "unknown element symbol '" + symbol + "'");
  }
  return found->second;
}

}  // namespace nucleate::cli
