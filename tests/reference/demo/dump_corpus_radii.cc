// Prints the corpus generator's radius tables as JSON for corpus_radii_reference.py: every typed-in
// entry, and whether some composition of the corpus uses it.
#include <iostream>
#include <set>
#include <tuple>

#include "core/elements/elements.h"
#include "integrations/demo/corpus/catalogue.h"
#include "integrations/demo/corpus/radii.h"

int main() {
  using namespace nucleate::demo::corpus;
  std::set<std::tuple<int, int, int>> used_ions;  // Z, charge, coordination
  std::set<int> used_metals;
  for (const PreparedType& type : PrepareCatalogue()) {
    for (const Composition& c : type.compositions) {
      const Recipe& recipe = type.type->recipes[static_cast<std::size_t>(c.recipe)];
      for (std::size_t r = 0; r < c.numbers.size(); ++r) {
        if (c.bonding == Bonding::kIonic) {
          used_ions.insert({c.numbers[r], recipe.roles[r].charge, recipe.roles[r].coordination});
        } else {
          used_metals.insert(c.numbers[r]);
        }
      }
    }
  }
  std::cout.precision(6);
  std::cout << "{\"ionic\": [";
  bool first = true;
  for (const IonicRadius& r : IonicRadii()) {
    const int z = nucleate::elements::AtomicNumber(r.symbol);
    std::cout << (first ? "\n" : ",\n") << "  {\"symbol\": \"" << r.symbol << "\", \"charge\": " << r.charge
              << ", \"coordination\": " << r.coordination << ", \"spin\": \"" << r.spin
              << "\", \"radius\": " << r.radius << ", \"used\": "
              << (used_ions.count({z, r.charge, r.coordination}) ? "true" : "false") << "}";
    first = false;
  }
  std::cout << "\n], \"metallic\": [";
  first = true;
  for (const MetallicRadius& r : MetallicRadii()) {
    const int z = nucleate::elements::AtomicNumber(r.symbol);
    std::cout << (first ? "\n" : ",\n") << "  {\"symbol\": \"" << r.symbol << "\", \"radius\": " << r.radius
              << ", \"used\": " << (used_metals.count(z) ? "true" : "false") << "}";
    first = false;
  }
  std::cout << "\n]}\n";
  return 0;
}
