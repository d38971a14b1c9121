// Reading any structure file the library knows, by format or by the name's extension.
#pragma once

#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "core/common/error.h"
#include "core/structure/crystal.h"

namespace nucleate::structure::io {

enum class FileFormat { kFromName, kCif, kExtxyz };

// One structure of a file: where it came from, and the crystal or what made it unusable.
struct FileStructure {
  std::string source;                // "<name>#<block>" (CIF) or "<name>@<frame>" (extended XYZ)
  std::optional<Crystal> crystal;
  std::optional<Error> error;
  std::vector<std::string> warnings;
};

// Whether `name` ends in `extension` (".cif"), ignoring case: the one rule for telling formats
// from file names.
bool HasExtension(const std::string& name, const std::string& extension);

// .cif -> CIF; .xyz, .extxyz -> extended XYZ (case-insensitive). InvalidArgument naming the file
// for any other name when the format is kFromName.
FileFormat FormatFromName(const std::string& name);

// Every structure in `content`, in file order. A problem with the file as a whole (an unknown
// extension) is one entry with an error; a problem with one structure is that structure's entry.
// Never throws for content. The caller checks the content's size before it is held in memory.
std::vector<FileStructure> ReadStructureFile(const std::string& name, std::string_view content,
                                             FileFormat format, const StructureLimits& limits);

}  // namespace nucleate::structure::io
