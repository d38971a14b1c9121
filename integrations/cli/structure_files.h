// Structure files named on the command line, as StructureInput JSON for a request.
#pragma once

#include <string>
#include <vector>

namespace nucleate::cli {

// A JSON array of {"file": {...}} inputs, one per readable path (the library tells the format
// from the name). A path that cannot be read is named on stderr and counted in *unreadable.
std::string FileInputsJson(const std::vector<std::string>& paths, int* unreadable);

// One {"file": {...}} input; throws std::runtime_error naming the path if it cannot be read.
std::string FileInputJson(const std::string& path);

}  // namespace nucleate::cli
