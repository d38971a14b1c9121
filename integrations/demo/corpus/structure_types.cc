#include "integrations/demo/corpus/structure_type.h"

namespace nucleate::demo::corpus {

const std::vector<StructureType>& StructureTypes() {
  static const std::vector<StructureType> types = [] {
    std::vector<StructureType> all = CubicStructureTypes();
    for (auto part : {HexagonalStructureTypes(), LowerSymmetryStructureTypes()}) {
      all.insert(all.end(), part.begin(), part.end());
    }
    return all;
  }();
  return types;
}

}  // namespace nucleate::demo::corpus
