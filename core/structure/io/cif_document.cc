#include "core/structure/io/cif_document.h"

#include <utility>

namespace nucleate::structure::io {

namespace {

// A block-level failure with the place to resume from.
struct BlockFailure {
  Error error;
  std::size_t resume_offset;
  int resume_line;
};

class DocumentParser {
 public:
  DocumentParser(std::string_view text, const std::string& file_name,
                 const CifDocumentOptions& options)
      : tokenizer_(text, file_name, options.tokenizer), file_name_(file_name), options_(options) {}

  std::vector<CifBlockParse> Run();

 private:
  CifToken Next();
  void PushBack(CifToken token) { pushed_ = std::move(token); }
  [[noreturn]] void Fail(const CifToken& at, ErrorKind kind, const std::string& message);
  const CifKeepRule* RuleFor(const std::string& tag) const;
  void ParseBody(CifBlock& block);
  void ParseItem(CifBlock& block, const CifToken& tag_token);
  void ParseLoop(CifBlock& block, const CifToken& loop_token);

  // Counts a value about to be stored in the current block against max_stored_values.
  void Store(const CifToken& at);

  CifTokenizer tokenizer_;
  std::int64_t stored_ = 0;
  const std::string& file_name_;
  const CifDocumentOptions& options_;
  std::optional<CifToken> pushed_;
};

CifToken DocumentParser::Next() {
  if (pushed_) {
    CifToken token = std::move(*pushed_);
    pushed_.reset();
    return token;
  }
  try {
    return tokenizer_.Next();
  } catch (const Error& e) {
    throw BlockFailure{e, tokenizer_.failed_line_offset(), tokenizer_.failed_line()};
  }
}

void DocumentParser::Fail(const CifToken& at, ErrorKind kind, const std::string& message) {
  throw BlockFailure{Error(kind, file_name_ + ":" + std::to_string(at.line), message),
                     at.line_offset, at.line};
}

void DocumentParser::Store(const CifToken& at) {
  if (++stored_ > options_.max_stored_values) {
    Fail(at, ErrorKind::kLimitExceeded,
         "data block holds more than " + std::to_string(options_.max_stored_values) +
             " values of the kinds read (cell, symmetry, atom sites)");
  }
}

const CifKeepRule* DocumentParser::RuleFor(const std::string& tag) const {
  for (const CifKeepRule& rule : options_.keep) {
    if (tag.compare(0, rule.prefix.size(), rule.prefix) == 0) {
      return rule.max_rows < 0 ? nullptr : &rule;
    }
  }
  return nullptr;
}

void DocumentParser::ParseItem(CifBlock& block, const CifToken& tag_token) {
  CifToken value = Next();
  if (value.kind != CifToken::Kind::kValue) {
    PushBack(std::move(value));
    Fail(tag_token, ErrorKind::kInvalidArgument, "data name " + tag_token.text + " has no value");
  }
  const std::string tag = NormaliseCifTag(tag_token.text);
  if (!RuleFor(tag)) return;
  if (block.items.count(tag) || block.LoopWith(tag)) {
    Fail(tag_token, ErrorKind::kInvalidArgument,
         "data name " + tag_token.text + " appears twice in the block (CIF 1.1 forbids this)");
  }
  Store(tag_token);
  block.items[tag] = CifValue{std::move(value.text), value.quoted, value.line};
}

void DocumentParser::ParseLoop(CifBlock& block, const CifToken& loop_token) {
  CifLoop loop;
  loop.line = loop_token.line;
  const CifKeepRule* rule = nullptr;
  CifToken token = Next();
  while (token.kind == CifToken::Kind::kTag) {
    std::string tag = NormaliseCifTag(token.text);
    if (const CifKeepRule* r = RuleFor(tag)) {
      if (!rule || r->max_rows < rule->max_rows) rule = r;
    }
    if (loop.Column(tag) >= 0 || (rule && (block.items.count(tag) || block.LoopWith(tag)))) {
      Fail(token, ErrorKind::kInvalidArgument,
           "data name " + token.text + " appears twice in the block (CIF 1.1 forbids this)");
    }
    loop.tags.push_back(std::move(tag));
    token = Next();
  }
  if (loop.tags.empty()) Fail(loop_token, ErrorKind::kInvalidArgument, "loop_ without data names");
  // Values are counted for every loop but stored only for kept ones; the row cap is checked
  // before each value is stored, so a huge loop is refused without being held.
  std::uint64_t count = 0;
  const std::uint64_t columns = loop.tags.size();
  while (token.kind == CifToken::Kind::kValue) {
    ++count;
    if (rule) {
      if (count > static_cast<std::uint64_t>(rule->max_rows) * columns) {
        Fail(loop_token, ErrorKind::kLimitExceeded,
             "loop of " + loop.tags.front() + " has more than " + std::to_string(rule->max_rows) +
                 " rows, above the limit");
      }
      Store(loop_token);
      loop.values.push_back(CifValue{std::move(token.text), token.quoted, token.line});
    }
    token = Next();
  }
  PushBack(std::move(token));
  if (count == 0) {
    Fail(loop_token, ErrorKind::kInvalidArgument,
         "loop_ of " + loop.tags.front() + " has no values");
  }
  if (count % columns != 0) {
    Fail(loop_token, ErrorKind::kInvalidArgument,
         "loop_ of " + loop.tags.front() + " has " + std::to_string(count) +
             " values, not a multiple of its " + std::to_string(columns) +
             " data names (truncated or garbled loop)");
  }
  if (rule) block.loops.push_back(std::move(loop));
}

void DocumentParser::ParseBody(CifBlock& block) {
  while (true) {
    CifToken token = Next();
    switch (token.kind) {
      case CifToken::Kind::kEnd:
      case CifToken::Kind::kDataBlock:
        PushBack(std::move(token));
        return;
      case CifToken::Kind::kTag:
        ParseItem(block, token);
        break;
      case CifToken::Kind::kLoop:
        ParseLoop(block, token);
        break;
      case CifToken::Kind::kValue:
        Fail(token, ErrorKind::kInvalidArgument,
             "value '" + token.text + "' without a data name before it");
      case CifToken::Kind::kGlobal:
      case CifToken::Kind::kSave:
      case CifToken::Kind::kStop:
        Fail(token, ErrorKind::kInvalidArgument,
             "global_, save_ and stop_ are reserved words not used in CIF 1.1 data files");
    }
  }
}

std::vector<CifBlockParse> DocumentParser::Run() {
  std::vector<CifBlockParse> results;
  while (true) {
    if (static_cast<std::int64_t>(results.size()) >= options_.max_blocks) {
      results.push_back(CifBlockParse{
          "", 0, std::nullopt,
          Error(ErrorKind::kLimitExceeded, file_name_,
                "more than " + std::to_string(options_.max_blocks) +
                    " data blocks; the rest of the file was not read")});
      return results;
    }
    CifBlockParse entry;
    try {
      CifToken header = Next();
      if (header.kind == CifToken::Kind::kEnd) break;
      if (header.kind != CifToken::Kind::kDataBlock) {
        entry.line = header.line;
        Fail(header, ErrorKind::kInvalidArgument,
             "content before the first data_ block header (CIF 1.1 requires every item to be "
             "inside a data block)");
      }
      entry.name = header.text;
      entry.line = header.line;
      stored_ = 0;
      CifBlock block;
      block.name = header.text;
      block.line = header.line;
      ParseBody(block);
      entry.block = std::move(block);
      results.push_back(std::move(entry));
    } catch (const BlockFailure& failure) {
      const Error& e = failure.error;
      const std::string where =
          entry.name.empty() ? std::string() : " (data block '" + entry.name + "')";
      entry.error = Error(e.kind(), e.field(), e.detail() + where);
      results.push_back(std::move(entry));
      pushed_.reset();
      if (!tokenizer_.SkipToDataBlockAfter(failure.resume_offset, failure.resume_line)) break;
    }
  }
  if (results.empty()) {
    results.push_back(CifBlockParse{
        "", 0, std::nullopt,
        InvalidArgument(file_name_ + ":1", "no data_ block found (empty or not a CIF file)")});
  }
  return results;
}

}  // namespace

int CifLoop::Column(std::string_view tag) const {
  for (std::size_t i = 0; i < tags.size(); ++i) {
    if (tags[i] == tag) return static_cast<int>(i);
  }
  return -1;
}

const CifValue* CifBlock::Item(std::string_view tag) const {
  const auto it = items.find(std::string(tag));
  return it == items.end() ? nullptr : &it->second;
}

const CifLoop* CifBlock::LoopWith(std::string_view tag) const {
  for (const CifLoop& loop : loops) {
    if (loop.Column(tag) >= 0) return &loop;
  }
  return nullptr;
}

std::string NormaliseCifTag(std::string_view tag) {
  std::string out(tag);
  for (char& c : out) {
    if (c >= 'A' && c <= 'Z') c = static_cast<char>(c - 'A' + 'a');
    if (c == '.') c = '_';
  }
  return out;
}

std::vector<CifBlockParse> ParseCifDocument(std::string_view text, const std::string& file_name,
                                            const CifDocumentOptions& options) {
  // A UTF-8 byte-order mark at the very start is an editor's marker, not content (CIF 2.0 allows
  // it there, from memory): read past it instead of refusing the file for "content before the
  // first data_ block".
  constexpr std::string_view kByteOrderMark = "\xEF\xBB\xBF";
  if (text.substr(0, kByteOrderMark.size()) == kByteOrderMark) text.remove_prefix(kByteOrderMark.size());
  return DocumentParser(text, file_name, options).Run();
}

}  // namespace nucleate::structure::io
