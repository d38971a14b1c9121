#include "core/structure/io/extxyz_comment.h"

namespace nucleate::structure::io {

namespace {

bool IsSpace(char c) { return c == ' ' || c == '\t' || c == '\r' || c == '\n'; }

// Reads one key or value starting at `i`; stops at whitespace, or at '=' when reading a key.
bool ReadWord(std::string_view line, std::size_t& i, bool is_key, std::string& out, bool& quoted,
              std::string& problem) {
  out.clear();
  quoted = false;
  if (i < line.size() && line[i] == '"') {
    quoted = true;
    for (++i; i < line.size(); ++i) {
      if (line[i] == '\\' && i + 1 < line.size()) {
        const char next = line[++i];
        out.push_back(next == 'n' ? '\n' : next);
      } else if (line[i] == '"') {
        ++i;
        return true;
      } else {
        out.push_back(line[i]);
      }
    }
    problem = "unterminated double-quoted string";
    return false;
  }
  if (!is_key && i < line.size() && (line[i] == '{' || line[i] == '[')) {
    const char close = line[i] == '{' ? '}' : ']';
    const std::size_t end = line.find(close, i + 1);
    if (end == std::string_view::npos) {
      problem = std::string("unterminated '") + line[i] + "' array value";
      return false;
    }
    quoted = true;
    out.assign(line.substr(i + 1, end - i - 1));
    i = end + 1;
    return true;
  }
  while (i < line.size() && !IsSpace(line[i]) && !(is_key && line[i] == '=')) out.push_back(line[i++]);
  return true;
}

}  // namespace

std::optional<std::vector<ExtxyzPair>> ParseExtxyzComment(std::string_view line,
                                                           std::string& problem) {
  std::vector<ExtxyzPair> pairs;
  std::size_t i = 0;
  while (true) {
    while (i < line.size() && IsSpace(line[i])) ++i;
    if (i >= line.size()) return pairs;
    ExtxyzPair pair;
    bool key_quoted = false;
    if (!ReadWord(line, i, true, pair.key, key_quoted, problem)) return std::nullopt;
    if (pair.key.empty()) {
      problem = "empty key (a '=' with nothing before it)";
      return std::nullopt;
    }
    std::size_t j = i;
    while (j < line.size() && IsSpace(line[j])) ++j;
    if (j < line.size() && line[j] == '=') {
      i = j + 1;
      while (i < line.size() && IsSpace(line[i])) ++i;
      if (!ReadWord(line, i, false, pair.value, pair.quoted, problem)) return std::nullopt;
    } else {
      pair.value = "T";  // a bare key is a logical true
    }
    pairs.push_back(std::move(pair));
  }
}

std::string QuoteExtxyzValue(std::string_view value) {
  std::string out = "\"";
  for (char c : value) {
    if (c == '"' || c == '\\') out.push_back('\\');
    out.push_back(c == '\n' || c == '\r' ? ' ' : c);
  }
  out.push_back('"');
  return out;
}

}  // namespace nucleate::structure::io
