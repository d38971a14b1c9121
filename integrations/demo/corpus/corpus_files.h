// The corpus on disk: one binary nucleate.v1.StructureSet (what `nucleate train` reads through
// data.structure_set), optionally one P1 CIF per structure, and text files such as the manifest.
#pragma once

#include <filesystem>
#include <string>

#include "integrations/demo/corpus/corpus.h"

namespace nucleate::demo::corpus {

// Binary protobuf, serialised deterministically: the same corpus gives the same bytes.
std::string StructureSetBytes(const Corpus& corpus);

// Writes `bytes` to `path` through a temporary file in the same folder and a rename, so a reader
// never sees half a file. nucleate::Error (kIo) naming the path when that fails.
void WriteFileAtomically(const std::filesystem::path& path, const std::string& bytes);

// One "<label>.cif" per structure (core's P1 writer). Creates the folder.
void WriteCifFolder(const Corpus& corpus, const std::filesystem::path& folder);

}  // namespace nucleate::demo::corpus
