// The lexical rules are those of the IUCr CIF 1.1 specification ("Syntax" section); each test
// names the rule it checks.
#include "core/structure/io/cif_tokenizer.h"

#include <string>
#include <vector>

#include <gtest/gtest.h>

#include "core/common/error.h"

namespace nucleate::structure::io {
namespace {

using Kind = CifToken::Kind;

std::vector<CifToken> Tokens(const std::string& text) {
  CifTokenizer tokenizer(text, "t.cif");
  std::vector<CifToken> out;
  while (true) {
    CifToken t = tokenizer.Next();
    if (t.kind == Kind::kEnd) break;
    out.push_back(std::move(t));
  }
  return out;
}

// The error a text raises while tokenizing, as what() text; "" if none.
std::string TokenizeError(const std::string& text, CifTokenizerLimits limits = {}) {
  CifTokenizer tokenizer(text, "t.cif", limits);
  try {
    while (tokenizer.Next().kind != Kind::kEnd) {
    }
  } catch (const Error& e) {
    EXPECT_EQ(e.kind(), ErrorKind::kInvalidArgument);
    return e.what();
  }
  return "";
}

TEST(CifTokenizer, ReservedWordsAreCaseInsensitive) {
  // CIF 1.1: data_, loop_, global_, save_ and stop_ are reserved in any case.
  const auto t = Tokens("DATA_Block1\nLoop_\n_a\n1\n");
  ASSERT_EQ(t.size(), 4u);
  EXPECT_EQ(t[0].kind, Kind::kDataBlock);
  EXPECT_EQ(t[0].text, "Block1");
  EXPECT_EQ(t[1].kind, Kind::kLoop);
  EXPECT_EQ(t[2].kind, Kind::kTag);
  EXPECT_EQ(t[3].kind, Kind::kValue);
  EXPECT_EQ(t[3].line, 4);
}

TEST(CifTokenizer, QuoteEndsOnlyBeforeWhitespace) {
  // CIF 1.1: a quoted string ends at a matching quote followed by whitespace, so an apostrophe
  // inside ("O'Neil") does not end it.
  const auto t = Tokens("_name 'O'Neil' _other \"a\"b c\" _third \"say \"hi\" now\"\n");
  ASSERT_EQ(t.size(), 7u);
  EXPECT_EQ(t[1].text, "O'Neil");
  EXPECT_TRUE(t[1].quoted);
  EXPECT_EQ(t[3].text, "a\"b c");
  // ...and a quote followed by a blank does end it, even where a person would read on.
  EXPECT_EQ(t[5].text, "say \"hi");
  EXPECT_EQ(t[6].text, "now\"");
  EXPECT_FALSE(t[6].quoted);
}

TEST(CifTokenizer, QuotedStringAtEndOfLineAndFile) {
  const auto t = Tokens("_a 'x y'\n_b 'z'");
  ASSERT_EQ(t.size(), 4u);
  EXPECT_EQ(t[1].text, "x y");
  EXPECT_EQ(t[3].text, "z");
}

TEST(CifTokenizer, SemicolonTextField) {
  // CIF 1.1: ';' in column 1 opens and closes a text field; the value excludes the final line
  // terminator; a ';' elsewhere is ordinary text.
  const auto t = Tokens("_a\n;first line\n second; line\n;\n_b 1\n");
  ASSERT_EQ(t.size(), 4u);
  EXPECT_EQ(t[1].kind, Kind::kValue);
  EXPECT_TRUE(t[1].quoted);
  EXPECT_EQ(t[1].text, "first line\n second; line");
  EXPECT_EQ(t[2].text, "_b");
  EXPECT_EQ(t[2].line, 5);
}

TEST(CifTokenizer, CommentsAndHashInsideValues) {
  // CIF 1.1: '#' starts a comment only where a token could start.
  const auto t = Tokens("# header\n_a x#y # trailing comment\n_b '#not a comment'\n");
  ASSERT_EQ(t.size(), 4u);
  EXPECT_EQ(t[1].text, "x#y");
  EXPECT_EQ(t[3].text, "#not a comment");
}

TEST(CifTokenizer, CrLfAndCrLineEndings) {
  const auto t = Tokens("_a 1\r\n_b 2\r_c 3\n");
  ASSERT_EQ(t.size(), 6u);
  EXPECT_EQ(t[2].line, 2);
  EXPECT_EQ(t[4].line, 3);
}

TEST(CifTokenizer, NullValuesAreUnquotedOnly) {
  const auto t = Tokens("_a ? _b . _c '?'\n");
  ASSERT_EQ(t.size(), 6u);
  EXPECT_FALSE(t[1].quoted);
  EXPECT_FALSE(t[3].quoted);
  EXPECT_TRUE(t[5].quoted);
}

TEST(CifTokenizer, UnterminatedQuoteNamesItsLine) {
  EXPECT_EQ(TokenizeError("_a 1\n_b 'open\n_c 2\n"),
            "t.cif:2: unterminated quoted string (no closing ' followed by whitespace on this line)");
}

TEST(CifTokenizer, UnterminatedTextFieldNamesTheOpeningLine) {
  const std::string message = TokenizeError("_a 1\n_b\n;text\nmore text\n");
  EXPECT_EQ(message.rfind("t.cif:3: unterminated semicolon text field", 0), 0u) << message;
}

TEST(CifTokenizer, OverlongLineIsRefused) {
  CifTokenizerLimits limits;
  limits.max_line_length = 100;
  const std::string message = TokenizeError("_a 1\n_b " + std::string(200, 'x') + "\n", limits);
  EXPECT_EQ(message.rfind("t.cif:2: line is 203 characters long", 0), 0u) << message;
}

TEST(CifTokenizer, ControlCharacterIsRefused) {
  // CIF 1.1 allows printable characters, tab and line terminators only.
  const std::string message = TokenizeError(std::string("_a 1\n_b \x01\x02\n", 11));
  EXPECT_EQ(message.rfind("t.cif:2: control character 0x01", 0), 0u) << message;
}

TEST(CifTokenizer, TextFieldSizeIsCapped) {
  CifTokenizerLimits limits;
  limits.max_text_field_bytes = 50;
  std::string text = "_a\n;\n";
  for (int i = 0; i < 10; ++i) text += "0123456789\n";
  text += ";\n";
  const std::string message = TokenizeError(text, limits);
  EXPECT_EQ(message.rfind("t.cif:2: semicolon text field longer than 50 bytes", 0), 0u) << message;
}

TEST(CifTokenizer, RecoveryFindsTheNextDataBlock) {
  const std::string text = "data_a\n_b 'open\n_c 1\n  data_next\n_d 2\n";
  CifTokenizer tokenizer(text, "t.cif");
  EXPECT_EQ(tokenizer.Next().kind, Kind::kDataBlock);
  EXPECT_EQ(tokenizer.Next().kind, Kind::kTag);
  EXPECT_THROW(tokenizer.Next(), Error);
  EXPECT_EQ(tokenizer.failed_line(), 2);
  ASSERT_TRUE(tokenizer.SkipToDataBlockAfter(tokenizer.failed_line_offset(), tokenizer.failed_line()));
  const CifToken next = tokenizer.Next();
  EXPECT_EQ(next.kind, Kind::kDataBlock);
  EXPECT_EQ(next.text, "next");
  EXPECT_EQ(next.line, 4);
}

}  // namespace
}  // namespace nucleate::structure::io
