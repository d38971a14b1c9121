#include "core/train/unclosed_quote.h"

#include <set>
#include <utility>

#include "core/common/error.h"

namespace nucleate::train {
namespace {

// yaml-cpp's marks count bytes after a UTF-8 byte order mark, which it drops.
std::size_t MarkOffset(const std::string& text) {
  return text.compare(0, 3, "\xEF\xBB\xBF") == 0 ? 3 : 0;
}

bool IsSpace(char c) { return c == ' ' || c == '\t' || c == '\n' || c == '\r'; }

// True when the quoted scalar opening at text[open] ('"' or '\'') has its closing quote, scanned
// as YAML 1.2 reads it: in double quotes a backslash escapes the next character, in single
// quotes '' stands for one quote.
bool IsClosed(const std::string& text, std::size_t open) {
  const char quote = text[open];
  for (std::size_t i = open + 1; i < text.size(); ++i) {
    if (quote == '"' && text[i] == '\\') {
      ++i;
    } else if (text[i] == quote) {
      if (quote == '\'' && i + 1 < text.size() && text[i + 1] == '\'') {
        ++i;
      } else {
        return true;
      }
    }
  }
  return false;
}

class QuoteWalk {
 public:
  QuoteWalk(const std::string& text, const std::string& source) : text_(text), source_(source) {}

  void Visit(const YAML::Node& node) {
    if (!node || node.Mark().pos < 0) return;
    // Two nodes of one type never start at one byte, but an alias is the node it names.
    if (!seen_.emplace(node.Mark().pos, static_cast<int>(node.Type())).second) return;
    if (node.IsScalar()) {
      CheckScalar(node);
    } else if (node.IsSequence()) {
      for (const auto& item : node) Visit(item);
    } else if (node.IsMap()) {
      for (const auto& entry : node) {
        Visit(entry.first);
        Visit(entry.second);
      }
    }
  }

 private:
  void CheckScalar(const YAML::Node& node) const {
    if (node.Tag() != "!") return;  // plain scalars take tag "?"; quoted and block ones "!"
    std::size_t at = static_cast<std::size_t>(node.Mark().pos) + MarkOffset(text_);
    // The mark may sit on an anchor or tag written before the quote ("&name "x"").
    for (int properties = 0; properties < 2 && at < text_.size() &&
                             (text_[at] == '&' || text_[at] == '!');
         ++properties) {
      while (at < text_.size() && !IsSpace(text_[at])) ++at;
      while (at < text_.size() && IsSpace(text_[at])) ++at;
    }
    // A block scalar (| or >), or a mark this scan cannot place: nothing to check.
    if (at >= text_.size() || (text_[at] != '"' && text_[at] != '\'')) return;
    if (!IsClosed(text_, at)) {
      const YAML::Mark& mark = node.Mark();
      throw InvalidArgument(source_ + ":" + std::to_string(mark.line + 1),
                            "not valid YAML: the quoted value opened at line " +
                                std::to_string(mark.line + 1) + ", column " +
                                std::to_string(mark.column + 1) + " is never closed");
    }
  }

  const std::string& text_;
  const std::string& source_;
  std::set<std::pair<int, int>> seen_;  // (byte of the mark, node type)
};

}  // namespace

void RefuseUnclosedQuotes(const YAML::Node& root, const std::string& text,
                          const std::string& source) {
  QuoteWalk(text, source).Visit(root);
}

}  // namespace nucleate::train
