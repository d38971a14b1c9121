// The space groups of the corpus's structure types. Source: International Tables for
// Crystallography, Vol. A (Space-group symmetry), the general-position list of each group; a few
// of its operations are given here as generators (from memory) and ExpandGroup closes them into
// the whole group, checking the count against the Tables' general-position multiplicity. The
// unit test checks each structure type's space group with spglib (AnalyseSymmetry).
//
// Settings: the standard one, with these choices where the Tables give two:
//   Fd-3m and I4_1/amd: origin choice 1 (origin at -43m and -4m2), where the site-symmetry
//     group of the origin has no translations;
//   trigonal R groups: hexagonal axes, obverse centring;
//   monoclinic groups: unique axis b, cell choice 1.
#include <map>

#include "core/common/error.h"
#include "integrations/demo/corpus/structure_type.h"

namespace nucleate::demo::corpus {
namespace {

const std::map<int, SpaceGroup>& Groups() {
  static const std::map<int, SpaceGroup> groups = {
      {13, {13, "P2/c", "unique axis b, cell choice 1", Centring::kP,
            {"-x,y,-z+1/2", "-x,-y,-z"}, 4}},
      {14, {14, "P2_1/c", "unique axis b, cell choice 1", Centring::kP,
            {"-x,y+1/2,-z+1/2", "-x,-y,-z"}, 4}},
      {62, {62, "Pnma", "", Centring::kP,
            {"-x+1/2,-y,z+1/2", "-x,y+1/2,-z", "-x,-y,-z"}, 8}},
      {136, {136, "P4_2/mnm", "", Centring::kP,
             {"-y+1/2,x+1/2,z+1/2", "y,x,-z", "-x,-y,-z"}, 16}},
      {141, {141, "I4_1/amd", "origin choice 1", Centring::kI,
             {"-y,x+1/2,z+1/4", "-x,y,z", "y,-x,-z"}, 32}},
      {148, {148, "R-3", "hexagonal axes", Centring::kR, {"-y,x-y,z", "-x,-y,-z"}, 18}},
      {164, {164, "P-3m1", "", Centring::kP, {"-y,x-y,z", "y,x,-z", "-x,-y,-z"}, 12}},
      {166, {166, "R-3m", "hexagonal axes", Centring::kR, {"-y,x-y,z", "y,x,-z", "-x,-y,-z"}, 36}},
      {167, {167, "R-3c", "hexagonal axes", Centring::kR,
             {"-y,x-y,z", "y,x,-z+1/2", "-x,-y,-z"}, 36}},
      {186, {186, "P6_3mc", "", Centring::kP, {"x-y,x,z+1/2", "-y,-x,z"}, 12}},
      {191, {191, "P6/mmm", "", Centring::kP, {"x-y,x,z", "y,x,-z", "-x,-y,-z"}, 24}},
      {194, {194, "P6_3/mmc", "", Centring::kP, {"x-y,x,z+1/2", "y,x,-z", "-x,-y,-z"}, 24}},
      {205, {205, "Pa-3", "", Centring::kP, {"z,x,y", "-x+1/2,-y,z+1/2", "-x,-y,-z"}, 24}},
      {216, {216, "F-43m", "", Centring::kF, {"z,x,y", "y,-x,-z"}, 96}},
      {221, {221, "Pm-3m", "", Centring::kP, {"z,x,y", "-y,x,z", "-x,-y,-z"}, 48}},
      {223, {223, "Pm-3n", "", Centring::kP, {"z,x,y", "-y+1/2,x+1/2,z+1/2", "-x,-y,-z"}, 48}},
      {225, {225, "Fm-3m", "", Centring::kF, {"z,x,y", "-y,x,z", "-x,-y,-z"}, 192}},
      {227, {227, "Fd-3m", "origin choice 1", Centring::kF,
             {"z,x,y", "y,-x,-z", "-x+1/4,-y+1/4,-z+1/4"}, 192}},
      {229, {229, "Im-3m", "", Centring::kI, {"z,x,y", "-y,x,z", "-x,-y,-z"}, 96}},
  };
  return groups;
}

}  // namespace

const SpaceGroup& GroupNumber(int number) {
  const auto it = Groups().find(number);
  if (it == Groups().end()) {
    throw Internal("space group " + std::to_string(number) +
                   " is not among the corpus's groups (space_groups_used.cc)");
  }
  return it->second;
}

}  // namespace nucleate::demo::corpus
