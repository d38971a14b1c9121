#include "core/structure/io/structure_file.h"

#include <algorithm>
#include <cctype>

#include "core/structure/io/cif_reader.h"
#include "core/structure/io/extxyz.h"

namespace nucleate::structure::io {

bool HasExtension(const std::string& name, const std::string& extension) {
  std::string text = name;
  std::transform(text.begin(), text.end(), text.begin(),
                 [](unsigned char c) { return static_cast<char>(std::tolower(c)); });
  return text.size() >= extension.size() &&
         text.compare(text.size() - extension.size(), extension.size(), extension) == 0;
}

FileFormat FormatFromName(const std::string& name) {
  if (HasExtension(name, ".cif")) return FileFormat::kCif;
  if (HasExtension(name, ".xyz") || HasExtension(name, ".extxyz")) return FileFormat::kExtxyz;
  throw InvalidArgument(name, "cannot tell the format from the name: use .cif, .xyz or .extxyz, "
                              "or give the format");
}

std::vector<FileStructure> ReadStructureFile(const std::string& name, std::string_view content,
                                             FileFormat format, const StructureLimits& limits) {
  std::vector<FileStructure> out;
  try {
    if (format == FileFormat::kFromName) format = FormatFromName(name);
    if (format == FileFormat::kCif) {
      CifReadOptions options;
      options.limits = limits;
      for (CifBlockResult& block : ReadCif(content, name, options)) {
        out.push_back({name + "#" + block.block_name, std::move(block.crystal),
                       std::move(block.error), std::move(block.warnings)});
      }
    } else {
      ExtxyzReadOptions options;
      options.limits = limits;
      for (ExtxyzFrameResult& frame : ReadExtxyz(content, name, options)) {
        out.push_back({name + "@" + std::to_string(frame.frame), std::move(frame.crystal),
                       std::move(frame.error), std::move(frame.warnings)});
      }
      // A file without a single frame must not vanish from the caller's report (an empty CIF
      // is refused by its reader for the same reason: "no data_ block").
      if (out.empty()) throw InvalidArgument(name + ":1", "no frame: the file is empty or blank");
    }
  } catch (const Error& error) {
    // A problem with the file as a whole: one entry, so the caller's other files go on.
    out.push_back({name, std::nullopt, error, {}});
  }
  return out;
}

}  // namespace nucleate::structure::io
