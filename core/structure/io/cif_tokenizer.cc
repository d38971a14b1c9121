#include "core/structure/io/cif_tokenizer.h"

#include <cstdio>

#include "core/common/error.h"

namespace nucleate::structure::io {

namespace {

bool IsBlank(char c) { return c == ' ' || c == '\t'; }

char Lower(char c) { return (c >= 'A' && c <= 'Z') ? static_cast<char>(c - 'A' + 'a') : c; }

// Reserved words are case-insensitive (CIF 1.1 specification, reserved words).
bool StartsWithNoCase(std::string_view s, std::string_view prefix) {
  if (s.size() < prefix.size()) return false;
  for (std::size_t i = 0; i < prefix.size(); ++i) {
    if (Lower(s[i]) != prefix[i]) return false;
  }
  return true;
}

bool EqualsNoCase(std::string_view s, std::string_view word) {
  return s.size() == word.size() && StartsWithNoCase(s, word);
}

}  // namespace

CifTokenizer::CifTokenizer(std::string_view text, std::string file_name, CifTokenizerLimits limits)
    : text_(text), file_name_(std::move(file_name)), limits_(limits) {}

void CifTokenizer::Fail(int line, std::size_t line_offset, const std::string& message) {
  failed_line_ = line;
  failed_line_offset_ = line_offset;
  throw InvalidArgument(file_name_ + ":" + std::to_string(line), message);
}

// Every line is checked once, when the tokenizer first enters it: its length against the limit,
// and its characters against what CIF 1.1 allows (printable text, tab). A binary or garbled file
// fails here on its first bad line instead of producing nonsense tokens.
void CifTokenizer::CheckLine() {
  checked_line_ = line_;
  std::size_t end = line_offset_;
  while (end < text_.size() && !IsNewline(text_[end])) {
    const unsigned char c = static_cast<unsigned char>(text_[end]);
    if ((c < 0x20 && c != '\t') || c == 0x7f) {
      char code[8];
      std::snprintf(code, sizeof(code), "0x%02x", c);
      Fail(line_, line_offset_,
           std::string("control character ") + code + " (not allowed in a CIF 1.1 text file)");
    }
    ++end;
  }
  if (end - line_offset_ > limits_.max_line_length) {
    Fail(line_, line_offset_,
         "line is " + std::to_string(end - line_offset_) + " characters long, above the limit of " +
             std::to_string(limits_.max_line_length) + " (CIF 1.1 allows 2048)");
  }
}

void CifTokenizer::ConsumeNewline() {
  // "\r\n", "\n" and a lone "\r" each end one line.
  if (text_[pos_] == '\r' && pos_ + 1 < text_.size() && text_[pos_ + 1] == '\n') ++pos_;
  ++pos_;
  ++line_;
  line_offset_ = pos_;
  CheckLine();
}

CifToken CifTokenizer::StartToken(CifToken::Kind kind, bool quoted) const {
  CifToken token;
  token.kind = kind;
  token.quoted = quoted;
  token.line = line_;
  token.line_offset = line_offset_;
  return token;
}

CifToken CifTokenizer::Next() {
  if (checked_line_ != line_) CheckLine();
  // Whitespace and comments. '#' starts a comment only where a token could start, which is the
  // only place this loop looks at it.
  while (!AtEnd()) {
    const char c = text_[pos_];
    if (IsBlank(c)) {
      ++pos_;
    } else if (IsNewline(c)) {
      ConsumeNewline();
    } else if (c == '#') {
      while (!AtEnd() && !IsNewline(text_[pos_])) ++pos_;
    } else {
      break;
    }
  }
  if (AtEnd()) return StartToken(CifToken::Kind::kEnd, false);
  const char c = text_[pos_];
  if (c == ';' && pos_ == line_offset_) return TextField();
  if (c == '\'' || c == '"') return QuotedString();
  return BareWord();
}

// A text field opens with ';' in the first column and closes at the next line whose first
// character is ';'. The value is everything between, without the final line terminator
// (CIF 1.1 specification, text fields).
CifToken CifTokenizer::TextField() {
  CifToken token = StartToken(CifToken::Kind::kValue, true);
  ++pos_;  // the opening ';'
  while (true) {
    const std::size_t start = pos_;
    while (!AtEnd() && !IsNewline(text_[pos_])) ++pos_;
    if (token.text.size() + (pos_ - start) + 1 > limits_.max_text_field_bytes) {
      Fail(token.line, token.line_offset,
           "semicolon text field longer than " + std::to_string(limits_.max_text_field_bytes) +
               " bytes");
    }
    token.text.append(text_.substr(start, pos_ - start));
    if (AtEnd()) {
      Fail(token.line, token.line_offset,
           "unterminated semicolon text field (no line starting with ';' closes it)");
    }
    ConsumeNewline();
    if (!AtEnd() && text_[pos_] == ';') {
      ++pos_;
      return token;
    }
    token.text.push_back('\n');
  }
}

// CIF 1.1: a quoted string ends at the first matching quote that is followed by whitespace or
// the end of the line, so "'O'Neil'" style quotes inside the string are allowed. It cannot span
// lines.
CifToken CifTokenizer::QuotedString() {
  CifToken token = StartToken(CifToken::Kind::kValue, true);
  const char quote = text_[pos_];
  const std::size_t start = pos_ + 1;
  for (std::size_t i = start; i < text_.size() && !IsNewline(text_[i]); ++i) {
    if (text_[i] != quote) continue;
    const bool closes = i + 1 >= text_.size() || IsBlank(text_[i + 1]) || IsNewline(text_[i + 1]);
    if (closes) {
      token.text.assign(text_.substr(start, i - start));
      pos_ = i + 1;
      return token;
    }
  }
  Fail(token.line, token.line_offset,
       std::string("unterminated quoted string (no closing ") + quote +
           " followed by whitespace on this line)");
}

CifToken CifTokenizer::BareWord() {
  CifToken token = StartToken(CifToken::Kind::kValue, false);
  const std::size_t start = pos_;
  while (!AtEnd() && !IsBlank(text_[pos_]) && !IsNewline(text_[pos_])) ++pos_;
  const std::string_view word = text_.substr(start, pos_ - start);
  if (StartsWithNoCase(word, "data_")) {
    token.kind = CifToken::Kind::kDataBlock;
    token.text.assign(word.substr(5));
    if (token.text.empty()) Fail(token.line, token.line_offset, "data_ header without a block name");
  } else if (EqualsNoCase(word, "loop_")) {
    token.kind = CifToken::Kind::kLoop;
  } else if (EqualsNoCase(word, "global_")) {
    token.kind = CifToken::Kind::kGlobal;
  } else if (StartsWithNoCase(word, "save_")) {
    token.kind = CifToken::Kind::kSave;
  } else if (EqualsNoCase(word, "stop_")) {
    token.kind = CifToken::Kind::kStop;
  } else if (word.front() == '_') {
    token.kind = CifToken::Kind::kTag;
    token.text.assign(word);
  } else {
    token.kind = CifToken::Kind::kValue;
    token.text.assign(word);
  }
  return token;
}

bool CifTokenizer::SkipToDataBlockAfter(std::size_t line_offset, int line) {
  // Plain line scanning, no tokens: after an unterminated text field or quote the token stream
  // cannot be trusted, but a line that begins with data_ is the next block's header.
  std::size_t p = line_offset;
  int n = line;
  while (true) {
    while (p < text_.size() && !IsNewline(text_[p])) ++p;
    if (p >= text_.size()) {
      pos_ = text_.size();
      return false;
    }
    if (text_[p] == '\r' && p + 1 < text_.size() && text_[p + 1] == '\n') ++p;
    ++p;
    ++n;
    std::size_t q = p;
    while (q < text_.size() && IsBlank(text_[q])) ++q;
    if (StartsWithNoCase(text_.substr(q), "data_")) {
      pos_ = p;
      line_ = n;
      line_offset_ = p;
      return true;  // Next() checks the line before reading it
    }
  }
}

}  // namespace nucleate::structure::io
