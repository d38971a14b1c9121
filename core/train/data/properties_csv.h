// The properties table of a training set: a CSV whose first column names a structure and whose
// other columns are scalar properties. Only the text layer lives here; matching rows to
// structures and reading numbers is load_dataset.cc's business.
#pragma once

#include <string>
#include <string_view>
#include <vector>

#include "core/train/data/training_example.h"

namespace nucleate::train::data {

struct PropertyRow {
  std::string key;                  // first column, surrounding blanks removed
  int line = 0;                     // 1-based
  std::vector<std::string> values;  // one per PropertyTable::columns, blanks removed
};

struct PropertyTable {
  std::vector<std::string> columns;  // header names after "file"
  std::vector<PropertyRow> rows;     // in file order; malformed rows are left out
};

// RFC 4180 fields (comma-separated, optionally in double quotes with "" for a quote; blanks around
// a value are removed, inside the quotes too, since no key or number carries them), LF or CRLF
// line ends, blank lines skipped; a UTF-8 byte-order mark before the header is dropped
// (spreadsheet programs write one). A quoted field may not span lines here.
// Throws InvalidArgument(file_name) when there is no header, its first column is not "file", or
// a column name is empty or repeated. A row with the wrong number of fields, an unterminated
// quote or an empty key is added to `report` as a problem ("<file>:<line>") and left out.
PropertyTable ParsePropertiesCsv(std::string_view text, const std::string& file_name,
                                 DatasetReport& report);

}  // namespace nucleate::train::data
