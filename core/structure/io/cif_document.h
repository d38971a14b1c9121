// CIF 1.1 grammar on top of the tokenizer: a file is a sequence of data blocks, each holding
// single items (tag value) and loops (loop_ tags... values...). Only the items and loops a caller
// asks for are stored, so a CIF with a large reflection or bond table costs no memory for it,
// and every stored loop is capped in rows before its values are kept.
#pragma once

#include <cstdint>
#include <map>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "core/common/error.h"
#include "core/structure/io/cif_tokenizer.h"

namespace nucleate::structure::io {

struct CifValue {
  std::string text;
  bool quoted = false;
  int line = 0;
  // '?' (unknown) and '.' (inapplicable) are the CIF null values, but only when unquoted.
  bool IsNull() const { return !quoted && (text == "?" || text == "."); }
};

struct CifLoop {
  std::vector<std::string> tags;  // normalised, see NormaliseCifTag
  std::vector<CifValue> values;   // row-major
  int line = 0;                   // line of loop_

  std::size_t rows() const { return tags.empty() ? 0 : values.size() / tags.size(); }
  // Column of `tag`, or -1.
  int Column(std::string_view tag) const;
};

struct CifBlock {
  std::string name;
  int line = 0;  // line of the data_ header
  std::map<std::string, CifValue> items;
  std::vector<CifLoop> loops;

  const CifValue* Item(std::string_view tag) const;
  // The stored loop holding `tag`, or nullptr.
  const CifLoop* LoopWith(std::string_view tag) const;
};

// Which items and loops to keep: every tag starting with `prefix` (normalised), and a loop with
// such a tag is refused with kLimitExceeded once it has more than `max_rows` rows. The first rule
// whose prefix matches decides; a negative max_rows excludes the tags it matches (so
// "_atom_site_aniso_" can be dropped ahead of a rule keeping "_atom_site_").
struct CifKeepRule {
  std::string prefix;
  std::int64_t max_rows = 0;
};

struct CifDocumentOptions {
  CifTokenizerLimits tokenizer;
  std::vector<CifKeepRule> keep;
  std::int64_t max_blocks = 100000;  // a file of many tiny blocks must not grow without bound
  // Values stored per block, items and kept loop values together: many small kept loops or
  // thousands of distinct kept items must not add up to more than the row caps intend.
  std::int64_t max_stored_values = 1000000;
};

// One data block: the block, or the error that made it unreadable.
struct CifBlockParse {
  std::string name;  // empty when the error came before any data_ header
  int line = 0;
  std::optional<CifBlock> block;
  std::optional<Error> error;
};

// Data names are case-insensitive in CIF 1.1; DDLm-style names write the category separator as
// '.'. Both are folded so that "_Atom_Site.Fract_X" and "_atom_site_fract_x" are the same tag.
std::string NormaliseCifTag(std::string_view tag);

// Parses every data block. Never throws for content: a block with a syntax error becomes an
// error entry naming "<file>:<line>", and parsing resumes at the next line starting with data_.
std::vector<CifBlockParse> ParseCifDocument(std::string_view text, const std::string& file_name,
                                            const CifDocumentOptions& options);

}  // namespace nucleate::structure::io
