// CIF 1.1 lexical analysis (IUCr CIF 1.1 specification, "Syntax"): reserved words, data names,
// quoted strings, semicolon text fields and comments. Hand-written: see cif_reader.h for why
// Debian's libcifpp was not used.
#pragma once

#include <cstddef>
#include <string>
#include <string_view>

namespace nucleate::structure::io {

struct CifToken {
  enum class Kind { kEnd, kDataBlock, kLoop, kTag, kValue, kGlobal, kSave, kStop };
  Kind kind = Kind::kEnd;
  // kDataBlock: the block name; kTag: the data name as written; kValue: the value without its
  // quotes or semicolons.
  std::string text;
  // True for quoted strings and text fields: '?' and '.' there are text, not the null values.
  bool quoted = false;
  int line = 0;                  // 1-based line where the token starts
  std::size_t line_offset = 0;   // byte offset of the start of that line, for error recovery
};

struct CifTokenizerLimits {
  // CIF 1.1 specification: "lines ... limited to 2048 characters". Longer lines are refused,
  // which also bounds every token except text fields.
  std::size_t max_line_length = 2048;
  // Text fields can span lines; their total size is capped separately.
  std::size_t max_text_field_bytes = std::size_t{1} << 20;
};

class CifTokenizer {
 public:
  // `text` must outlive the tokenizer. `file_name` only labels errors.
  CifTokenizer(std::string_view text, std::string file_name, CifTokenizerLimits limits = {});

  // The next token. Throws nucleate::Error (kInvalidArgument, field "<file>:<line>") for an
  // unterminated quote or text field, an over-long line or a control character; the construct
  // that failed is then available from failed_line()/failed_line_offset().
  CifToken Next();

  int failed_line() const { return failed_line_; }
  std::size_t failed_line_offset() const { return failed_line_offset_; }

  // Error recovery: continues at the first line after the one starting at `line_offset` (line
  // number `line`) whose first non-blank characters are "data_". False when there is none.
  bool SkipToDataBlockAfter(std::size_t line_offset, int line);

 private:
  bool AtEnd() const { return pos_ >= text_.size(); }
  bool IsNewline(char c) const { return c == '\n' || c == '\r'; }
  void ConsumeNewline();
  void CheckLine();
  // A token of `kind` starting at the current position.
  CifToken StartToken(CifToken::Kind kind, bool quoted) const;
  [[noreturn]] void Fail(int line, std::size_t line_offset, const std::string& message);
  CifToken TextField();
  CifToken QuotedString();
  CifToken BareWord();

  std::string_view text_;
  std::string file_name_;
  CifTokenizerLimits limits_;
  std::size_t pos_ = 0;
  int line_ = 1;
  std::size_t line_offset_ = 0;
  int checked_line_ = 0;  // the last line whose length and characters were checked
  int failed_line_ = 0;
  std::size_t failed_line_offset_ = 0;
};

}  // namespace nucleate::structure::io
