#include "core/structure/io/extxyz.h"

#include <algorithm>
#include <cctype>
#include <cmath>
#include <utility>

#include "core/elements/elements.h"
#include "core/structure/io/extxyz_comment.h"
#include "core/structure/io/read_limits.h"
#include "core/structure/io/text_file.h"
#include "core/structure/io/text_number.h"
#include "core/structure/lattice.h"
#include "core/structure/validate.h"

namespace nucleate::structure::io {

namespace {

bool IsSpace(char c) { return c == ' ' || c == '\t' || c == '\r'; }

bool EqualsNoCase(std::string_view a, std::string_view b) {
  if (a.size() != b.size()) return false;
  for (std::size_t i = 0; i < a.size(); ++i) {
    if (std::tolower(static_cast<unsigned char>(a[i])) != std::tolower(static_cast<unsigned char>(b[i]))) {
      return false;
    }
  }
  return true;
}

std::vector<std::string_view> SplitWords(std::string_view line) {
  std::vector<std::string_view> words;
  std::size_t i = 0;
  while (i < line.size()) {
    while (i < line.size() && IsSpace(line[i])) ++i;
    const std::size_t start = i;
    while (i < line.size() && !IsSpace(line[i])) ++i;
    if (i > start) words.push_back(line.substr(start, i - start));
  }
  return words;
}

// Lines with their numbers; "\n" and "\r\n" endings.
class LineReader {
 public:
  explicit LineReader(std::string_view text) : text_(text) {}
  bool Next(std::string_view& line) {
    if (pos_ >= text_.size()) return false;
    std::size_t end = text_.find('\n', pos_);
    if (end == std::string_view::npos) end = text_.size();
    line = text_.substr(pos_, end - pos_);
    if (!line.empty() && line.back() == '\r') line.remove_suffix(1);
    pos_ = end + 1;
    ++number_;
    return true;
  }
  int number() const { return number_; }

 private:
  std::string_view text_;
  std::size_t pos_ = 0;
  int number_ = 0;
};

struct Column {
  std::string name;
  char type = 'R';
  int count = 1;
  int offset = 0;  // first word of the column in an atom line
};

// Properties=species:S:1:pos:R:3:... into columns; the total width says how many words each atom
// line must have, so columns we do not use are skipped by their declared widths.
std::vector<Column> ParseProperties(const std::string& text, std::string& problem) {
  std::vector<std::string> parts;
  std::size_t start = 0;
  while (true) {
    const std::size_t colon = text.find(':', start);
    parts.push_back(text.substr(start, colon - start));
    if (colon == std::string::npos) break;
    start = colon + 1;
  }
  std::vector<Column> columns;
  if (parts.size() % 3 != 0) {
    problem = "Properties '" + text + "' is not a list of name:type:count triples";
    return {};
  }
  int offset = 0;
  for (std::size_t i = 0; i < parts.size(); i += 3) {
    Column column;
    column.name = parts[i];
    const std::string& type = parts[i + 1];
    const std::optional<double> count = ParseDecimal(parts[i + 2]);
    if (column.name.empty() || type.size() != 1 || std::string("SRIL").find(type[0]) == std::string::npos ||
        !count || *count < 1 || *count > 1000 || *count != std::floor(*count)) {
      problem = "Properties entry '" + parts[i] + ":" + parts[i + 1] + ":" + parts[i + 2] +
                "' is not name:type:count with type S, R, I or L and count 1..1000";
      return {};
    }
    column.type = type[0];
    column.count = static_cast<int>(*count);
    column.offset = offset;
    offset += column.count;
    columns.push_back(std::move(column));
  }
  return columns;
}

const Column* FindColumn(const std::vector<Column>& columns, std::string_view name) {
  for (const Column& c : columns) {
    if (c.name == name) return &c;
  }
  return nullptr;
}

class FrameReader {
 public:
  FrameReader(const std::string& file, const ExtxyzReadOptions& options, ExtxyzFrameResult& result)
      : file_(file), options_(options), result_(result) {}

  Error Fail(int line, ErrorKind kind, const std::string& message) const {
    return Error(kind, file_ + ":" + std::to_string(line),
                 message + " (frame " + std::to_string(result_.frame) + ")");
  }

  // Interprets the comment line; sets up columns, lattice, properties and label.
  void Header(std::string_view comment, int line, std::int64_t atoms);
  // One atom line, appended to the crystal.
  void Atom(std::string_view text, int line);
  Crystal& crystal() { return crystal_; }

 private:
  const std::string& file_;
  const ExtxyzReadOptions& options_;
  ExtxyzFrameResult& result_;
  Crystal crystal_;
  std::vector<Column> columns_;
  int width_ = 0;
  const Column* species_ = nullptr;
  const Column* z_ = nullptr;
  const Column* pos_ = nullptr;
};

void FrameReader::Header(std::string_view comment, int line, std::int64_t atoms) {
  std::string problem;
  const std::optional<std::vector<ExtxyzPair>> pairs = ParseExtxyzComment(comment, problem);
  if (!pairs) throw Fail(line, ErrorKind::kInvalidArgument, "comment line: " + problem);
  std::string properties = "species:S:1:pos:R:3";  // the default when Properties is absent
  bool have_lattice = false;
  for (const ExtxyzPair& pair : *pairs) {
    if (EqualsNoCase(pair.key, "Lattice")) {
      std::string numbers = pair.value;
      for (char& c : numbers) {
        if (c == ',') c = ' ';
      }
      const std::vector<std::string_view> words = SplitWords(numbers);
      if (words.size() != 9) {
        throw Fail(line, ErrorKind::kInvalidArgument,
                   "Lattice has " + std::to_string(words.size()) + " numbers, not 9");
      }
      for (int k = 0; k < 9; ++k) {
        const std::optional<double> v = ParseDecimal(words[k]);
        if (!v) {
          throw Fail(line, ErrorKind::kInvalidArgument,
                     "Lattice entry '" + std::string(words[k]) + "' is not a finite number");
        }
        crystal_.lattice(k / 3, k % 3) = *v;
      }
      have_lattice = true;
    } else if (EqualsNoCase(pair.key, "Properties")) {
      properties = pair.value;
    } else if (EqualsNoCase(pair.key, "pbc")) {
      for (std::string_view flag : SplitWords(pair.value)) {
        if (flag == "F" || EqualsNoCase(flag, "false")) {
          throw Fail(line, ErrorKind::kUnsupported,
                     "pbc=\"" + pair.value + "\": a frame that is not periodic in all three "
                     "directions is not a crystal");
        }
      }
    } else if (pair.key == "label") {
      crystal_.label = pair.value;
    } else if (const std::optional<double> v = ParseDecimal(pair.value)) {
      crystal_.properties[pair.key] = *v;
    }
  }
  if (!have_lattice) {
    throw Fail(line, ErrorKind::kInvalidArgument,
               "no Lattice=\"...\" on the comment line: a crystal needs its cell");
  }
  const Eigen::Matrix3d& lattice = crystal_.lattice;
  for (int r = 0; r < 3; ++r) {
    if (lattice.row(r).norm() > options_.limits.max_cell_length) {
      throw Fail(line, ErrorKind::kLimitExceeded,
                 "cell vector " + std::string(1, "abc"[r]) + " is " +
                     FormatShortest(lattice.row(r).norm()) +
                     " A long, above the max_cell_length limit of " +
                     FormatShortest(options_.limits.max_cell_length) + " A");
    }
  }
  const double volume = SignedVolume(lattice);
  if (!(std::abs(volume) > 1e-6 * lattice.row(0).norm() * lattice.row(1).norm() * lattice.row(2).norm())) {
    throw Fail(line, ErrorKind::kInvalidArgument, "Lattice has zero volume");
  }
  columns_ = ParseProperties(properties, problem);
  if (columns_.empty()) throw Fail(line, ErrorKind::kInvalidArgument, problem);
  width_ = columns_.back().offset + columns_.back().count;
  species_ = FindColumn(columns_, "species");
  z_ = FindColumn(columns_, "Z");
  pos_ = FindColumn(columns_, "pos");
  if (species_ && (species_->type != 'S' || species_->count != 1)) {
    throw Fail(line, ErrorKind::kInvalidArgument, "Properties: species must be S:1");
  }
  if (z_ && (z_->type != 'I' || z_->count != 1)) {
    throw Fail(line, ErrorKind::kInvalidArgument, "Properties: Z must be I:1");
  }
  if (!species_ && !z_) {
    throw Fail(line, ErrorKind::kInvalidArgument, "Properties has neither species nor Z");
  }
  if (!pos_ || pos_->type != 'R' || pos_->count != 3) {
    throw Fail(line, ErrorKind::kInvalidArgument, "Properties needs pos:R:3");
  }
  // The count was checked against max_atoms before this frame was started.
  crystal_.numbers.reserve(static_cast<std::size_t>(atoms));
  crystal_.frac.reserve(static_cast<std::size_t>(atoms));
}

void FrameReader::Atom(std::string_view text, int line) {
  const std::vector<std::string_view> words = SplitWords(text);
  if (static_cast<int>(words.size()) != width_) {
    throw Fail(line, ErrorKind::kInvalidArgument,
               "atom line has " + std::to_string(words.size()) + " columns; Properties declares " +
                   std::to_string(width_));
  }
  int number = 0;
  if (species_) {
    const std::string symbol(words[species_->offset]);
    number = elements::AtomicNumber(symbol);
    if (number == 0) {
      throw Fail(line, ErrorKind::kInvalidArgument, "unknown element symbol '" + symbol + "' in species");
    }
  } else {
    const std::optional<double> z = ParseDecimal(words[z_->offset]);
    // The range first: converting a double outside int's range is undefined behaviour.
    if (!z || *z != std::floor(*z) || *z < 1 || *z > elements::kMaxAtomicNumber) {
      throw Fail(line, ErrorKind::kInvalidArgument,
                 "Z '" + std::string(words[z_->offset]) + "' is not an atomic number 1..118");
    }
    number = static_cast<int>(*z);
  }
  Eigen::Vector3d cart;
  for (int k = 0; k < 3; ++k) {
    const std::optional<double> v = ParseDecimal(words[pos_->offset + k]);
    if (!v) {
      throw Fail(line, ErrorKind::kInvalidArgument,
                 "position '" + std::string(words[pos_->offset + k]) + "' is not a finite number");
    }
    cart[k] = *v;
  }
  const Eigen::Vector3d frac = CartesianToFractional(crystal_.lattice, cart);
  if (!frac.allFinite() || frac.cwiseAbs().maxCoeff() > 1000) {
    throw Fail(line, ErrorKind::kInvalidArgument,
               "position lies more than 1000 cells away: not a plausible atom position");
  }
  crystal_.numbers.push_back(number);
  crystal_.frac.push_back(WrapFractional(frac));
}

bool IsBlank(std::string_view line) {
  for (char c : line) {
    if (!IsSpace(c)) return false;
  }
  return true;
}

// The atom count: digits only (surrounding blanks allowed). Nullopt when garbled; values above
// 10^15 are reported as that, without overflow.
std::optional<std::int64_t> ParseCount(std::string_view line) {
  const std::vector<std::string_view> words = SplitWords(line);
  if (words.size() != 1) return std::nullopt;
  std::int64_t n = 0;
  for (char c : words[0]) {
    if (c < '0' || c > '9') return std::nullopt;
    if (n < 1000000000000000LL) n = n * 10 + (c - '0');
  }
  return n;
}

void CheckOptions(const ExtxyzReadOptions& o) {
  CheckReadLimits(o.limits, o.max_line_length, o.max_frames, "max_frames");
}

}  // namespace

std::vector<ExtxyzFrameResult> ReadExtxyz(std::string_view text, const std::string& file_name,
                                          const ExtxyzReadOptions& options) {
  CheckOptions(options);
  std::vector<ExtxyzFrameResult> results;
  LineReader lines(text);
  std::string_view line;
  const auto too_long = [&](std::string_view l) { return l.size() > options.max_line_length; };
  while (true) {
    // Blank lines between frames and at the end are tolerated.
    bool have = false;
    while ((have = lines.Next(line)) && IsBlank(line)) {
    }
    if (!have) break;
    ExtxyzFrameResult result;
    result.frame = static_cast<int>(results.size()) + 1;
    result.line = lines.number();
    const auto fail = [&](int at, ErrorKind kind, const std::string& message) {
      return Error(kind, file_name + ":" + std::to_string(at),
                   message + " (frame " + std::to_string(result.frame) + ")");
    };
    if (static_cast<std::int64_t>(results.size()) >= options.max_frames) {
      result.error = fail(result.line, ErrorKind::kLimitExceeded,
                          "more than " + std::to_string(options.max_frames) +
                              " frames; the rest of the file was not read");
      results.push_back(std::move(result));
      break;
    }
    const std::optional<std::int64_t> count = too_long(line) ? std::nullopt : ParseCount(line);
    if (!count) {
      // Without the count the frame's extent is unknown: nothing after it can be trusted.
      result.error = fail(result.line, ErrorKind::kInvalidArgument,
                          "expected the number of atoms, found '" +
                              std::string(line.substr(0, 40)) + "'; reading stops here");
      results.push_back(std::move(result));
      break;
    }
    std::optional<Error> error;
    if (*count == 0) error = fail(result.line, ErrorKind::kInvalidArgument, "frame has no atoms");
    if (*count > options.limits.max_atoms) {
      error = fail(result.line, ErrorKind::kLimitExceeded,
                   "frame has " + std::to_string(*count) + " atoms, above the max_atoms limit of " +
                       std::to_string(options.limits.max_atoms));
    }
    FrameReader frame(file_name, options, result);
    bool truncated = false;
    for (std::int64_t k = -1; k < *count; ++k) {  // k = -1 is the comment line
      if (!lines.Next(line)) {
        truncated = true;
        if (error) break;  // the frame's first problem (a count above the limit) is the one to report
        error = fail(lines.number(), ErrorKind::kInvalidArgument,
                     "file ends after " + std::to_string(std::max<std::int64_t>(k, 0)) + " of " +
                         std::to_string(*count) + " atom lines (truncated)");
        break;
      }
      if (error) continue;  // skip the rest of a bad frame by its declared length
      try {
        if (too_long(line)) {
          throw fail(lines.number(), ErrorKind::kLimitExceeded,
                     "line longer than " + std::to_string(options.max_line_length) + " characters");
        }
        if (k < 0) {
          frame.Header(line, lines.number(), *count);
        } else {
          frame.Atom(line, lines.number());
        }
      } catch (const Error& e) {
        error = e;
      }
    }
    if (error) {
      result.error = std::move(error);
    } else {
      Crystal& crystal = frame.crystal();
      if (crystal.label.empty()) crystal.label = file_name + "#" + std::to_string(result.frame);
      // The checks every structure in core passes, blamed on this frame.
      if (const std::optional<CrystalDefect> defect = FindCrystalDefect(crystal, options.limits)) {
        result.error = fail(result.line, defect->error.kind(),
                            "structure is not usable: " + std::string(defect->error.what()));
      } else {
        result.crystal = std::move(crystal);
      }
    }
    results.push_back(std::move(result));
    if (truncated) break;
  }
  return results;
}

std::vector<ExtxyzFrameResult> ReadExtxyzFile(const std::string& path,
                                              const ExtxyzReadOptions& options) {
  CheckOptions(options);
  const std::string text = ReadTextFile(path, options.max_file_bytes);
  return ReadExtxyz(text, path, options);
}

std::string WriteExtxyzFrame(const Crystal& crystal) {
  const Eigen::Matrix3d& lattice = crystal.lattice;
  if (!lattice.allFinite()) throw InvalidArgument("lattice", "is not finite");
  if (SignedVolume(lattice) == 0) throw InvalidArgument("lattice", "has zero volume");
  if (crystal.frac.size() != crystal.numbers.size()) {
    throw InvalidArgument("frac", "has " + std::to_string(crystal.frac.size()) + " entries for " +
                                      std::to_string(crystal.numbers.size()) + " atomic numbers");
  }
  std::string out = std::to_string(crystal.size()) + "\nLattice=\"";
  for (int k = 0; k < 9; ++k) {
    if (k > 0) out += ' ';
    out += FormatShortest(lattice(k / 3, k % 3));
  }
  out += "\" Properties=species:S:1:pos:R:3 pbc=\"T T T\"";
  for (const auto& [key, value] : crystal.properties) {
    const std::string field = "properties['" + key + "']";
    bool valid = !key.empty() && (std::isalpha(static_cast<unsigned char>(key[0])) || key[0] == '_');
    for (char c : key) {
      valid = valid && (std::isalnum(static_cast<unsigned char>(c)) || c == '_' || c == '-');
    }
    if (!valid) throw InvalidArgument(field, "key must match [A-Za-z_][A-Za-z0-9_-]*");
    if (EqualsNoCase(key, "Lattice") || EqualsNoCase(key, "Properties") || EqualsNoCase(key, "pbc") ||
        key == "label") {
      throw InvalidArgument(field, "is a key the format reserves");
    }
    if (!std::isfinite(value)) throw InvalidArgument(field, "is not finite");
    out += " " + key + "=" + FormatShortest(value);
  }
  if (!crystal.label.empty()) out += " label=" + QuoteExtxyzValue(crystal.label);
  out += '\n';
  for (std::size_t i = 0; i < crystal.size(); ++i) {
    const std::string index = "[" + std::to_string(i) + "]";
    const elements::Element* e = elements::FindElement(crystal.numbers[i]);
    if (!e) throw InvalidArgument("numbers" + index, "is not an atomic number 1..118");
    if (!crystal.frac[i].allFinite()) throw InvalidArgument("frac" + index, "is not finite");
    const Eigen::Vector3d cart = FractionalToCartesian(lattice, crystal.frac[i]);
    out += e->symbol;
    for (int k = 0; k < 3; ++k) out += " " + FormatShortest(cart[k]);
    out += '\n';
  }
  return out;
}

std::string WriteExtxyz(const std::vector<Crystal>& frames) {
  std::string out;
  for (std::size_t f = 0; f < frames.size(); ++f) {
    try {
      out += WriteExtxyzFrame(frames[f]);
    } catch (const Error& e) {
      throw e.WithinField("frames[" + std::to_string(f) + "]");
    }
  }
  return out;
}

}  // namespace nucleate::structure::io
