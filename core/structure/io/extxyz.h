// Extended XYZ (multi-frame) reading and writing. Conventions followed: the extended XYZ
// description of libAtoms/QUIP as implemented by ASE (ase.io.extxyz): line 1 the atom count,
// line 2 key=value pairs with Lattice="ax ay az bx by bz cx cy cz" (rows a, b, c, angstrom) and
// Properties=name:type:count:... (types S, R, I, L), then one line per atom.
#pragma once

#include <cstdint>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "core/common/error.h"
#include "core/structure/crystal.h"

namespace nucleate::structure::io {

struct ExtxyzReadOptions {
  StructureLimits limits;
  std::size_t max_line_length = std::size_t{1} << 16;  // info lines can carry long arrays
  std::int64_t max_file_bytes = std::int64_t{256} << 20;
  std::int64_t max_frames = 1000000;
};

struct ExtxyzFrameResult {
  int frame = 0;                     // 1-based position in the file
  int line = 0;                      // line of the atom-count line
  // Cell from Lattice, species from the "species" column (or "Z" when there is none), positions
  // from "pos" (Cartesian angstrom) converted to wrapped fractional coordinates. Numeric scalar
  // key=value pairs go to properties. label = the frame's "label" value, else "<file>#<frame>".
  std::optional<Crystal> crystal;
  std::optional<Error> error;        // field "<file>:<line>"
  std::vector<std::string> warnings;
};

// Every frame in order. Never throws for content: a bad frame is an error entry and reading goes
// on with the next frame as long as its atom-count line was readable (the frame's extent is then
// known); a garbled count line or a truncated file ends the reading with an error entry.
std::vector<ExtxyzFrameResult> ReadExtxyz(std::string_view text, const std::string& file_name,
                                          const ExtxyzReadOptions& options = {});

// The same for a file: kIo when unreadable, kLimitExceeded when above max_file_bytes.
std::vector<ExtxyzFrameResult> ReadExtxyzFile(const std::string& path,
                                              const ExtxyzReadOptions& options = {});

// One frame: Lattice, Properties=species:S:1:pos:R:3, pbc="T T T", each property as key=value and
// the label as label="...". Numbers are written in their shortest exact form, so a read gives
// back the same doubles for the lattice and properties. Raises InvalidArgument naming the field
// for a structure or property that cannot be written (key not [A-Za-z_][A-Za-z0-9_-]*, a reserved
// key, a non-finite value).
std::string WriteExtxyzFrame(const Crystal& crystal);

// Frames one after another: the multi-frame file.
std::string WriteExtxyz(const std::vector<Crystal>& frames);

}  // namespace nucleate::structure::io
