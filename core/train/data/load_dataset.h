// Reading a training set: structure files or a StructureSet file, an optional properties table,
// Niggli reduction and symmetry labels. Bad input is reported and skipped, never fatal, so one
// broken file among ten thousand does not stop a training run; what was skipped is in the report.
#pragma once

#include <cstdint>
#include <functional>
#include <string>
#include <vector>

#include "core/structure/crystal.h"
#include "core/train/data/training_example.h"

namespace nucleate::train::data {

// Exactly one of `directory` and `structure_set_file` is set.
struct DataSource {
  // Every regular file in it named *.cif, *.xyz or *.extxyz (any case), in byte order of the
  // names; subdirectories are not entered. Entries with other names are counted as ignored; a
  // folder or broken link with a structure file's name is a problem.
  std::string directory;
  // A binary protobuf nucleate.v1.StructureSet (schemas/nucleate/v1/dataset.proto).
  std::string structure_set_file;

  // Optional CSV, header `file,<name>,<name>...`, one row per structure. The first column names
  // the structure by its source ("<file>#<block>", "<file>@<frame>"; in a StructureSet its
  // label, or "structures[i]" when the label is empty) or, for a file holding exactly one
  // structure, by the file name alone. An empty cell is a missing value. Fields may be quoted
  // (RFC 4180) but may not span lines.
  std::string properties_csv;
  // The properties each example carries, in this order. A value comes from the CSV when it has
  // one, else from the structure's own properties (extended XYZ key=value pairs, the
  // StructureSet's properties map), else it is NaN. A name no kept structure has a value for is
  // an error (a misspelt name must not train an unconditioned model unnoticed).
  std::vector<std::string> property_names;

  double symprec = 0.1;  // angstrom, spglib's distance tolerance for space groups
  structure::StructureLimits limits;
  std::int64_t max_structures = 1000000;  // found, kept or not; above it LoadDataset throws
  std::int64_t max_file_bytes = std::int64_t{256} << 20;  // per structure file and for the CSV
  // A StructureSet is read whole; protobuf cannot parse a message of 2 GiB or more.
  std::int64_t max_structure_set_bytes = std::int64_t{1} << 30;
};

struct LoadProgress {
  std::int64_t files_done = 0;   // a StructureSet counts as one file
  std::int64_t files_total = 0;
  std::int64_t structures_kept = 0;
};
// Called after every file (every 1000 structures of a StructureSet); returning false stops the
// load with ErrorKind::kCancelled.
using LoadProgressCallback = std::function<bool(const LoadProgress&)>;

// Throws only for the source as a whole: InvalidArgument naming the DataSource field for bad
// settings ("symprec", "property_names[1]", both or neither of directory/structure_set_file),
// kIo for a directory, StructureSet or CSV that cannot be read, InvalidArgument("properties_csv")
// for a CSV without a usable header, LimitExceeded("max_structures"), and InvalidArgument naming
// the directory or file when not one structure is usable (the message quotes the first problems).
Dataset LoadDataset(const DataSource& source, const LoadProgressCallback& progress = nullptr);

}  // namespace nucleate::train::data
