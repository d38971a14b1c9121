// What the structure readers promise about what they return, checked on every fuzz input by
// fuzz_cif_reader.cc and fuzz_extxyz_reader.cc. A reader "never throws for file content" and gives
// per structure "the crystal, or the error that made it unusable" (cif_reader.h, extxyz.h); a
// crystal it returns is one the rest of core accepts (core/structure/validate.h) with fractional
// coordinates "wrapped to [0, 1)" (core/structure/crystal.h). A broken promise is a bug even
// without a crash, so it aborts and libFuzzer saves the input.
#pragma once

#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <optional>
#include <string>

#include "core/common/error.h"
#include "core/structure/crystal.h"
#include "core/structure/validate.h"

namespace nucleate::fuzz {

[[noreturn]] inline void BrokenPromise(const std::string& what) {
  std::fprintf(stderr, "reader promise broken: %s\n", what.c_str());
  std::abort();
}

// `where` names the block or frame in the message.
inline void CheckReaderResult(const std::optional<structure::Crystal>& crystal,
                              const std::optional<Error>& error,
                              const structure::StructureLimits& limits, const std::string& where) {
  if (crystal.has_value() == error.has_value()) {
    BrokenPromise(where + ": has " + (crystal ? "both a crystal and an error" : "neither a crystal nor an error"));
  }
  if (!crystal) return;
  if (const auto defect = structure::FindCrystalDefect(*crystal, limits)) {
    BrokenPromise(where + ": returned a crystal that core refuses: " + defect->error.what());
  }
  for (std::size_t i = 0; i < crystal->frac.size(); ++i) {
    for (int k = 0; k < 3; ++k) {
      const double f = crystal->frac[i][k];
      if (!(f >= 0.0 && f < 1.0)) {
        BrokenPromise(where + ": fractional coordinate " + std::to_string(k) + " of site " +
                      std::to_string(i) + " is not wrapped to [0, 1)");
      }
    }
  }
}

}  // namespace nucleate::fuzz
