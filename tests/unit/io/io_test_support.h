// Helpers shared by the io tests.
#pragma once

#include <string>
#include <vector>

#include <gtest/gtest.h>

#include "core/structure/io/cif_reader.h"

namespace nucleate::structure::io::testing {

// Reads `text` as file "demo.cif" and requires exactly `blocks` data blocks.
inline std::vector<CifBlockResult> ReadDemo(const std::string& text, std::size_t blocks = 1,
                                            const CifReadOptions& options = {}) {
  std::vector<CifBlockResult> results = ReadCif(text, "demo.cif", options);
  EXPECT_EQ(results.size(), blocks);
  return results;
}

// The what() of a block's error, or "" when the block has none.
inline std::string ErrorText(const CifBlockResult& r) { return r.error ? r.error->what() : ""; }

// A cubic cell block with the given extra text; sites and operations come from `body`.
inline std::string CubicBlock(const std::string& name, double a, const std::string& body) {
  const std::string s = std::to_string(a);
  return "data_" + name + "\n_cell_length_a " + s + "\n_cell_length_b " + s +
         "\n_cell_length_c " + s +
         "\n_cell_angle_alpha 90\n_cell_angle_beta 90\n_cell_angle_gamma 90\n" + body;
}

// Does `frac` contain `p` (periodic, to `tol` per coordinate)?
inline bool HasSite(const std::vector<Eigen::Vector3d>& frac, const Eigen::Vector3d& p,
                    double tol = 1e-9) {
  for (const Eigen::Vector3d& f : frac) {
    Eigen::Vector3d d = f - p;
    for (int k = 0; k < 3; ++k) d[k] -= std::round(d[k]);
    if (d.cwiseAbs().maxCoeff() < tol) return true;
  }
  return false;
}

}  // namespace nucleate::structure::io::testing
