// The second line of an extended XYZ frame: whitespace-separated key=value pairs (extended XYZ
// conventions, libAtoms/QUIP and ASE): values bare, in double quotes with backslash escapes, or
// in braces/brackets for arrays; a key without '=' is a logical true.
#pragma once

#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace nucleate::structure::io {

struct ExtxyzPair {
  std::string key;
  std::string value;     // without its quotes; "T" for a bare key
  bool quoted = false;   // the value was in double quotes, braces or brackets
};

// The pairs in order, or nullopt with `problem` set when a quote or bracket is not closed or a
// key is empty.
std::optional<std::vector<ExtxyzPair>> ParseExtxyzComment(std::string_view line,
                                                           std::string& problem);

// Double-quoted, with '\' and '"' escaped: the form ParseExtxyzComment and ASE read back.
std::string QuoteExtxyzValue(std::string_view value);

}  // namespace nucleate::structure::io
