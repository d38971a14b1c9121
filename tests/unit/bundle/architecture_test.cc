#include "core/model/architecture.h"

#include <gtest/gtest.h>

#include <functional>
#include <limits>
#include <string>

#include "core/common/error.h"

namespace nucleate::model {
namespace {

Architecture ValidArchitecture() {
  Architecture a;
  a.elements = {3, 8, 26};
  a.properties = {"band_gap_ev"};
  return a;
}

// Runs ValidateArchitecture on a valid architecture changed by `change`; returns the error.
Error RefusalOf(const std::function<void(Architecture&)>& change) {
  Architecture a = ValidArchitecture();
  change(a);
  try {
    ValidateArchitecture(a);
  } catch (const Error& error) {
    return error;
  }
  ADD_FAILURE() << "not refused";
  return Internal("not refused");
}

TEST(ValidateArchitecture, AcceptsTheDefaultsWithAVocabulary) {
  EXPECT_NO_THROW(ValidateArchitecture(ValidArchitecture()));
  Architecture at_limits = ValidArchitecture();
  const ArchitectureLimits limits;
  at_limits.hidden = limits.max_hidden;
  at_limits.layers = limits.max_layers;
  at_limits.time_embedding = limits.max_time_embedding;
  EXPECT_NO_THROW(ValidateArchitecture(at_limits, limits));
}

// Each refusal names the field, so a user knows what to change (core/common/error.h contract).
TEST(ValidateArchitecture, RefusesEachOutOfRangeFieldByName) {
  struct Case {
    const char* field;
    std::function<void(Architecture&)> change;
  };
  const double nan = std::numeric_limits<double>::quiet_NaN();
  const Case cases[] = {
      {"hidden", [](Architecture& a) { a.hidden = 0; }},
      {"hidden", [](Architecture& a) { a.hidden = 1025; }},
      {"layers", [](Architecture& a) { a.layers = 0; }},
      {"fourier_frequencies", [](Architecture& a) { a.fourier_frequencies = 0; }},
      {"radial_basis", [](Architecture& a) { a.radial_basis = -1; }},
      {"radial_max", [nan](Architecture& a) { a.radial_max = nan; }},
      {"time_embedding", [](Architecture& a) { a.time_embedding = 31; }},
      {"cutoff_from_atoms", [](Architecture& a) { a.cutoff_from_atoms = 1; }},
      {"cutoff", [](Architecture& a) { a.cutoff = 0.0; }},
      {"species_mode", [](Architecture& a) { a.species_mode = static_cast<SpeciesMode>(7); }},
      {"elements", [](Architecture& a) { a.elements.clear(); }},
      {"elements[1]",
       [](Architecture& a) {
         a.elements = {8, 3};
       }},
      {"elements[1]",
       [](Architecture& a) {
         a.elements = {8, 8};
       }},
      {"elements[0]", [](Architecture& a) { a.elements = {0}; }},
      {"elements[2]",
       [](Architecture& a) {
         a.elements = {1, 2, 119};
       }},
      {"properties[1]",
       [](Architecture& a) {
         a.properties = {"x", "x"};
       }},
      {"properties[0]", [](Architecture& a) { a.properties = {""}; }},
      {"properties", [](Architecture& a) { a.properties.assign(65, "p"); }},
  };
  for (const Case& c : cases) {
    const Error error = RefusalOf(c.change);
    EXPECT_EQ(error.kind(), ErrorKind::kInvalidArgument) << c.field;
    EXPECT_EQ(error.field(), c.field) << error.what();
  }
}

TEST(ValidateArchitecture, TheLargestAtomicNumberIs118) {
  // The periodic table IUPAC has named ends at oganesson, Z = 118 (common practice, no source).
  Architecture a = ValidArchitecture();
  a.elements = {1, 118};
  EXPECT_NO_THROW(ValidateArchitecture(a));
}

}  // namespace
}  // namespace nucleate::model
