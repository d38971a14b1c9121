#include "core/structure/io/cif_reader.h"

#include <algorithm>
#include <cctype>
#include <cmath>
#include <map>
#include <utility>

#include "core/elements/elements.h"
#include "core/structure/io/cif_document.h"
#include "core/structure/io/element_symbol.h"
#include "core/structure/io/read_limits.h"
#include "core/structure/io/site_expansion.h"
#include "core/structure/io/symmetry_operation.h"
#include "core/structure/io/text_file.h"
#include "core/structure/io/text_number.h"
#include "core/structure/lattice.h"
#include "core/structure/validate.h"

namespace nucleate::structure::io {

namespace {

// A coordinate further out than this is a garbled number, not a position: wrapping 1e300 into
// [0, 1) would silently give 0.
constexpr double kMaxAbsFractional = 1000.0;

// Errors inside one block: the field is "<file>:<line>", the message ends naming the block.
class BlockContext {
 public:
  BlockContext(const std::string& file, const CifBlock& block) : file_(file), block_(block) {}

  std::string Where(int line) const { return file_ + ":" + std::to_string(line); }
  Error Fail(ErrorKind kind, int line, const std::string& message) const {
    return Error(kind, Where(line), message + " (data block '" + block_.name + "')");
  }
  const CifBlock& block() const { return block_; }

  // A value given once: as an item, or as the only row of a loop.
  const CifValue* Single(std::string_view tag) const {
    if (const CifValue* item = block_.Item(tag)) return item;
    if (const CifLoop* loop = block_.LoopWith(tag)) {
      if (loop->rows() == 1) return &loop->values[loop->Column(tag)];
    }
    return nullptr;
  }

  double RequiredNumber(std::string_view tag) const {
    const CifValue* value = Single(tag);
    if (!value) {
      throw Fail(ErrorKind::kInvalidArgument, block_.line,
                 "missing " + std::string(tag) + " (a crystal needs its full unit cell)");
    }
    return Number(*value, tag);
  }

  double Number(const CifValue& value, std::string_view tag) const {
    if (value.IsNull()) {
      throw Fail(ErrorKind::kInvalidArgument, value.line,
                 "no value ('" + value.text + "') for " + std::string(tag));
    }
    const std::optional<double> number = ParseCifNumber(value.text);
    if (!number) {
      throw Fail(ErrorKind::kInvalidArgument, value.line,
                 "'" + value.text + "' in " + std::string(tag) + " is not a number");
    }
    return *number;
  }

 private:
  const std::string& file_;
  const CifBlock& block_;
};

// The atom-site table: a loop, or a single site written as plain items.
class SiteTable {
 public:
  explicit SiteTable(const CifBlock& block) : block_(block), loop_(block.LoopWith("_atom_site_fract_x")) {}

  std::size_t rows() const {
    if (loop_) return loop_->rows();
    return block_.Item("_atom_site_fract_x") ? 1 : 0;
  }
  const CifValue* Get(std::size_t row, std::string_view tag) const {
    if (!loop_) return block_.Item(tag);
    const int column = loop_->Column(tag);
    return column < 0 ? nullptr : &loop_->values[row * loop_->tags.size() + column];
  }
  int line() const { return loop_ ? loop_->line : 0; }

 private:
  const CifBlock& block_;
  const CifLoop* loop_;
};

Eigen::Matrix3d ReadCell(const BlockContext& ctx, const StructureLimits& limits,
                         std::vector<std::string>& warnings) {
  static const char* const kTags[6] = {"_cell_length_a", "_cell_length_b", "_cell_length_c",
                                       "_cell_angle_alpha", "_cell_angle_beta", "_cell_angle_gamma"};
  double values[6];
  int lines[6];
  for (int i = 0; i < 6; ++i) {
    values[i] = ctx.RequiredNumber(kTags[i]);
    lines[i] = ctx.Single(kTags[i])->line;
    if (i < 3 && values[i] > limits.max_cell_length) {
      throw ctx.Fail(ErrorKind::kLimitExceeded, lines[i],
                     std::string(kTags[i]) + " " + FormatShortest(values[i]) +
                         " A is above the max_cell_length limit of " +
                         FormatShortest(limits.max_cell_length) + " A");
    }
  }
  LatticeParameters p;
  p.a = values[0];
  p.b = values[1];
  p.c = values[2];
  p.alpha = values[3];
  p.beta = values[4];
  p.gamma = values[5];
  Eigen::Matrix3d lattice;
  try {
    lattice = MatrixFromParameters(p);
  } catch (const Error& e) {
    // lattice.h names the parameter ("a".."gamma"); point at its line and tag instead.
    static const char* const kNames[6] = {"a", "b", "c", "alpha", "beta", "gamma"};
    int index = 5;
    for (int i = 0; i < 6; ++i) {
      if (e.field() == kNames[i]) index = i;
    }
    throw ctx.Fail(ErrorKind::kInvalidArgument, lines[index],
                   std::string(kTags[index]) + ": " + e.detail() + " (zero or negative cell volume)");
  }
  const double volume = SignedVolume(lattice);
  // Angles that close a cell only just (alpha = beta + gamma to 1e-9) give a volume that is zero
  // up to rounding: a degenerate cell, not a crystal.
  if (!std::isfinite(volume) || volume <= 1e-6 * p.a * p.b * p.c) {
    throw ctx.Fail(ErrorKind::kInvalidArgument, lines[5],
                   "zero or negative cell volume (" + FormatShortest(volume) +
                       " A^3) from the cell parameters");
  }
  if (const CifValue* stated = ctx.Single("_cell_volume")) {
    const std::optional<double> v = stated->IsNull() ? std::nullopt : ParseCifNumber(stated->text);
    if (v && std::abs(*v - volume) > 1e-3 * volume) {
      warnings.push_back(ctx.Where(stated->line) + ": _cell_volume " + stated->text +
                         " differs from the volume of the cell parameters, " +
                         FormatFixed(volume, 4) + " A^3; the parameters are used");
    }
  }
  return lattice;
}

int SiteElement(const BlockContext& ctx, const SiteTable& table, std::size_t row,
                const std::string& label) {
  if (const CifValue* type = table.Get(row, "_atom_site_type_symbol"); type && !type->IsNull()) {
    const int z = AtomicNumberFromTypeSymbol(type->text);
    if (z == 0) {
      throw ctx.Fail(ErrorKind::kInvalidArgument, type->line,
                     "unknown element symbol '" + type->text + "' in _atom_site_type_symbol");
    }
    return z;
  }
  const CifValue* label_value = table.Get(row, "_atom_site_label");
  if (!label_value || label_value->IsNull()) {
    const CifValue* x = table.Get(row, "_atom_site_fract_x");
    throw ctx.Fail(ErrorKind::kInvalidArgument, x->line,
                   "site has neither _atom_site_type_symbol nor _atom_site_label to name its element");
  }
  const int z = AtomicNumberFromSiteLabel(label);
  if (z == 0) {
    throw ctx.Fail(ErrorKind::kInvalidArgument, label_value->line,
                   "unknown element symbol '" + std::string(LeadingLetters(label)) +
                       "' in _atom_site_label '" + label + "' (no _atom_site_type_symbol)");
  }
  return z;
}

std::vector<AsymmetricSite> ReadSites(const BlockContext& ctx, const CifReadOptions& options) {
  const SiteTable table(ctx.block());
  if (table.rows() == 0) {
    const bool cartesian = ctx.block().Item("_atom_site_cartn_x") ||
                           ctx.block().LoopWith("_atom_site_cartn_x");
    throw ctx.Fail(cartesian ? ErrorKind::kUnsupported : ErrorKind::kInvalidArgument,
                   ctx.block().line,
                   cartesian ? "only Cartesian _atom_site_Cartn_* coordinates are given; "
                               "_atom_site_fract_x/y/z are required"
                             : "no atom sites (_atom_site_fract_x missing)");
  }
  static const char* const kCoordinate[3] = {"_atom_site_fract_x", "_atom_site_fract_y",
                                             "_atom_site_fract_z"};
  std::vector<AsymmetricSite> sites;
  sites.reserve(table.rows());  // bounded: the document parser capped the loop at max_atoms rows
  for (std::size_t row = 0; row < table.rows(); ++row) {
    AsymmetricSite site;
    const CifValue* label = table.Get(row, "_atom_site_label");
    site.label = label && !label->IsNull() ? label->text : "site " + std::to_string(row + 1);
    for (int k = 0; k < 3; ++k) {
      const CifValue* value = table.Get(row, kCoordinate[k]);
      if (!value) {
        throw ctx.Fail(ErrorKind::kInvalidArgument, table.line() ? table.line() : ctx.block().line,
                       std::string("missing ") + kCoordinate[k]);
      }
      site.frac[k] = ctx.Number(*value, kCoordinate[k]);
      if (std::abs(site.frac[k]) > kMaxAbsFractional) {
        throw ctx.Fail(ErrorKind::kInvalidArgument, value->line,
                       std::string(kCoordinate[k]) + " '" + value->text + "' of site '" +
                           site.label + "' is not a plausible fractional coordinate");
      }
    }
    site.where = ctx.Where(table.Get(row, kCoordinate[0])->line);
    site.number = SiteElement(ctx, table, row, site.label);
    if (const CifValue* occupancy = table.Get(row, "_atom_site_occupancy");
        occupancy && !occupancy->IsNull()) {
      const double occ = ctx.Number(*occupancy, "_atom_site_occupancy");
      if (occ < 1.0 - options.occupancy_tolerance) {
        throw ctx.Fail(ErrorKind::kUnsupported, occupancy->line,
                       "site '" + site.label + "' has occupancy " + occupancy->text +
                           ": partial occupancy (disorder) is not supported");
      }
      if (occ > 1.0 + options.occupancy_tolerance) {
        throw ctx.Fail(ErrorKind::kInvalidArgument, occupancy->line,
                       "site '" + site.label + "' has occupancy " + occupancy->text +
                           ", above 1");
      }
    }
    sites.push_back(std::move(site));
  }
  return sites;
}

// The operations of _space_group_symop_operation_xyz (current name), else of
// _symmetry_equiv_pos_as_xyz (the CIF 1.1 core dictionary's older name).
std::vector<SymmetryOperation> ReadOperations(const BlockContext& ctx) {
  std::vector<SymmetryOperation> ops;
  for (const char* tag : {"_space_group_symop_operation_xyz", "_symmetry_equiv_pos_as_xyz"}) {
    std::vector<const CifValue*> values;
    if (const CifLoop* loop = ctx.block().LoopWith(tag)) {
      const int column = loop->Column(tag);
      for (std::size_t r = 0; r < loop->rows(); ++r) {
        values.push_back(&loop->values[r * loop->tags.size() + column]);
      }
    } else if (const CifValue* item = ctx.block().Item(tag)) {
      values.push_back(item);
    }
    if (values.empty()) continue;
    ops.reserve(values.size());  // bounded by kMaxCifSymmetryOperations rows
    for (const CifValue* value : values) {
      try {
        ops.push_back(ParseSymmetryOperation(value->text, ctx.Where(value->line)));
      } catch (const Error& e) {
        throw ctx.Fail(e.kind(), value->line, e.detail() + " in " + tag);
      }
    }
    return ops;
  }
  return ops;
}

void ReadSpaceGroup(const BlockContext& ctx, CifBlockResult& result) {
  for (const char* tag : {"_space_group_name_h-m_alt", "_symmetry_space_group_name_h-m"}) {
    if (const CifValue* v = ctx.Single(tag); v && !v->IsNull()) {
      result.space_group_name = v->text;
      break;
    }
  }
  for (const char* tag : {"_space_group_it_number", "_symmetry_int_tables_number"}) {
    if (const CifValue* v = ctx.Single(tag); v && !v->IsNull()) {
      const std::optional<double> n = ParseCifNumber(v->text);
      if (n && *n >= 1 && *n <= 230 && *n == std::floor(*n)) {
        result.space_group_number = static_cast<int>(*n);
      } else {
        result.warnings.push_back(ctx.Where(v->line) + ": " + tag + " '" + v->text +
                                  "' is not a space-group number 1..230; ignored");
      }
      break;
    }
  }
}

bool IsP1(const CifBlockResult& result) {
  std::string compact;
  for (char c : result.space_group_name) {
    if (c != ' ' && c != '_') compact.push_back(c);
  }
  return result.space_group_number == 1 || compact == "P1";
}

void ReadBlock(const std::string& file, const CifBlock& block, const CifReadOptions& options,
               CifBlockResult& result) {
  const BlockContext ctx(file, block);
  ReadSpaceGroup(ctx, result);
  Crystal crystal;
  crystal.label = block.name;
  crystal.lattice = ReadCell(ctx, options.limits, result.warnings);
  const std::vector<AsymmetricSite> sites = ReadSites(ctx, options);
  std::vector<SymmetryOperation> ops = ReadOperations(ctx);
  if (ops.empty()) {
    if (!IsP1(result)) {
      // No operations and no table of the 230 groups to look them up in: read the sites as they
      // are, and say so, since for any group but P1 this is only part of the structure.
      result.warnings.push_back(
          ctx.Where(block.line) + ": no symmetry operations (_space_group_symop_operation_xyz or "
          "_symmetry_equiv_pos_as_xyz) in data block '" + block.name + "'" +
          (result.space_group_name.empty() ? std::string()
                                           : " for space group '" + result.space_group_name + "'") +
          "; the listed sites are read as the whole cell (P1)");
    }
    ops.emplace_back();  // identity
  } else {
    bool identity = false;
    for (const SymmetryOperation& op : ops) {
      identity = identity || (op.rotation == Eigen::Matrix3i::Identity() &&
                              op.translation.isZero(1e-12));
    }
    if (!identity) {
      result.warnings.push_back(ctx.Where(block.line) +
                                ": the symmetry operations do not include the identity x,y,z");
    }
  }
  ExpandedSites expanded;
  try {
    expanded = ExpandSites(crystal.lattice, sites, ops, options.merge_tolerance,
                           options.limits.max_atoms);
  } catch (const Error& e) {
    throw Error(e.kind(), e.field(), e.detail() + " (data block '" + block.name + "')");
  }
  crystal.numbers = std::move(expanded.numbers);
  crystal.frac = std::move(expanded.frac);
  for (std::string& w : expanded.warnings) result.warnings.push_back(std::move(w));
  // The checks every structure in core passes (volume per site and the rest), so that what the
  // reader returns is never refused later for a reason the file could have been blamed for.
  try {
    ValidateCrystal(crystal, options.limits);
  } catch (const Error& e) {
    throw ctx.Fail(e.kind(), block.line, "structure is not usable: " + std::string(e.what()));
  }
  result.crystal = std::move(crystal);
}

void CheckOptions(const CifReadOptions& o) {
  CheckReadLimits(o.limits, o.max_line_length, o.max_blocks, "max_blocks");
  if (!std::isfinite(o.merge_tolerance) || o.merge_tolerance <= 0 || o.merge_tolerance >= 1) {
    throw InvalidArgument("merge_tolerance", "must lie in (0, 1) angstrom");
  }
  if (!std::isfinite(o.occupancy_tolerance) || o.occupancy_tolerance < 0 ||
      o.occupancy_tolerance >= 0.5) {
    throw InvalidArgument("occupancy_tolerance", "must lie in [0, 0.5)");
  }
}

}  // namespace

std::vector<CifBlockResult> ReadCif(std::string_view text, const std::string& file_name,
                                    const CifReadOptions& options) {
  CheckOptions(options);
  CifDocumentOptions doc;
  doc.tokenizer.max_line_length = options.max_line_length;
  doc.max_blocks = options.max_blocks;
  // Room for a full atom-site loop of generous width (64 columns), the symmetry loops and the
  // single items; anything beyond is not a structure nucleate can use.
  doc.max_stored_values = options.limits.max_atoms * 64 + 4 * kMaxCifSymmetryOperations + 10000;
  doc.keep = {
      {"_atom_site_aniso_", -1},  // displacement tensors: not needed, never stored
      {"_atom_site_", options.limits.max_atoms},
      {"_space_group_symop_", kMaxCifSymmetryOperations},
      {"_symmetry_equiv_pos_", kMaxCifSymmetryOperations},
      {"_cell_length_", 1},
      {"_cell_angle_", 1},
      {"_cell_volume", 1},
      {"_space_group_name_h-m_alt", 1},
      {"_symmetry_space_group_name_h-m", 1},
      {"_space_group_it_number", 1},
      {"_symmetry_int_tables_number", 1},
  };
  std::vector<CifBlockResult> results;
  // Block names are unique in a file, compared without case (CIF 1.1 syntax, from memory): a
  // second block of a name is refused, so that "<file>#<block>" names one structure.
  std::map<std::string, int> first_line_of;
  for (CifBlockParse& parsed : ParseCifDocument(text, file_name, doc)) {
    CifBlockResult result;
    result.block_name = parsed.name;
    result.line = parsed.line;
    std::string folded = parsed.name;
    std::transform(folded.begin(), folded.end(), folded.begin(),
                   [](unsigned char c) { return static_cast<char>(std::tolower(c)); });
    const auto [first, inserted] = first_line_of.emplace(folded, parsed.line);
    if (parsed.error) {
      result.error = std::move(parsed.error);
    } else if (!inserted && !parsed.name.empty()) {
      result.error = InvalidArgument(
          file_name + ":" + std::to_string(parsed.line),
          "data block '" + parsed.name + "' has the name of the block at line " +
              std::to_string(first->second) +
              " (block names must be unique in a file, whatever their case)");
    } else {
      try {
        ReadBlock(file_name, *parsed.block, options, result);
      } catch (const Error& e) {
        result.crystal.reset();
        result.error = e;
      }
    }
    results.push_back(std::move(result));
  }
  return results;
}

std::vector<CifBlockResult> ReadCifFile(const std::string& path, const CifReadOptions& options) {
  CheckOptions(options);
  const std::string text = ReadTextFile(path, options.max_file_bytes);
  return ReadCif(text, path, options);
}

}  // namespace nucleate::structure::io
