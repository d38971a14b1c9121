// Reads crystal structures from CIF 1.1 files (IUCr CIF 1.1 specification; data names from the
// CIF core dictionary, both the older _symmetry_* and the newer _space_group_* forms).
//
// Why not Debian's libcifpp (libcifpp-dev 5.0.7, looked at first, as the issue asked): it is built
// for macromolecular mmCIF/PDBx. Its symmetry support is an internal table keyed by space-group
// number; it does not parse the x,y,z operations a small-molecule or inorganic CIF carries, which
// is what we must apply. It reports through std::cerr under a global VERBOSE switch (we never
// print and keep no mutable globals), drags in boost-regex and libcifpp-data (PDBx dictionaries
// with a weekly network-update cron job), and gives no way to cap line length or loop rows before
// allocating. A CIF 1.1 tokenizer is a few hundred lines; we wrote our own (cif_tokenizer.h).
#pragma once

#include <cstdint>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "core/common/error.h"
#include "core/structure/crystal.h"

namespace nucleate::structure::io {

struct CifReadOptions {
  StructureLimits limits;
  // Images of a site closer than this (periodic Cartesian distance, angstrom) are one site. 0.01 A
  // is far below any bond (the shortest, H-H, is 0.74 A) and above the rounding of coordinates
  // printed with 4 decimals in cells up to ~100 A (1e-4 * 100 A = 0.01 A).
  double merge_tolerance = 0.01;
  // Occupancies within this of 1 count as full (refinements print 0.9995 and 1.0002).
  double occupancy_tolerance = 1e-3;
  std::size_t max_line_length = 2048;             // CIF 1.1 specification
  std::int64_t max_file_bytes = std::int64_t{256} << 20;
  std::int64_t max_blocks = 100000;
};

// 192 is the most operations any space group has in its conventional cell (Fm-3m and the other
// F-centred cubic groups, International Tables A); the headroom admits non-standard settings.
constexpr std::int64_t kMaxCifSymmetryOperations = 1536;

// One data block: the crystal, or the error that made it unusable; warnings either way.
struct CifBlockResult {
  std::string block_name;
  int line = 0;                        // line of the data_ header (0 when there was none)
  std::optional<Crystal> crystal;      // label = block name
  std::optional<Error> error;          // field "<file>:<line>", message names the block
  std::vector<std::string> warnings;   // "<file>:<line>: ..." each
  std::string space_group_name;        // H-M symbol as written, empty when absent
  int space_group_number = 0;          // 0 when absent
};

// Every data block of `text`, in file order. Never throws for file content: each block's problem
// is in its own result and the following blocks are still read. Throws InvalidArgument only for
// bad options.
std::vector<CifBlockResult> ReadCif(std::string_view text, const std::string& file_name,
                                    const CifReadOptions& options = {});

// The same for a file; throws kIo when it cannot be read and kLimitExceeded when it is larger
// than options.max_file_bytes (checked before reading it).
std::vector<CifBlockResult> ReadCifFile(const std::string& path, const CifReadOptions& options = {});

}  // namespace nucleate::structure::io
