#include "methods/structure_inputs.h"

#include <cmath>
#include <string_view>

#include "codec.h"
#include "core/structure/io/structure_file.h"
#include "core/structure/lattice.h"
#include "core/structure/validate.h"

namespace nucleate::capi {
namespace {

std::vector<InputStructure> ReadFile(const v1::StructureFile& file, const InputLimits& limits) {
  const std::string name = file.name().empty() ? "(unnamed file)" : file.name();
  if (static_cast<std::int64_t>(file.content().size()) > limits.max_file_bytes) {
    return {{name, std::nullopt,
             LimitExceeded(name, std::to_string(file.content().size()) +
                                     " bytes is above limits.max_file_bytes = " +
                                     std::to_string(limits.max_file_bytes)),
             {},
             name}};
  }
  const bool json_name = structure::io::HasExtension(name, ".json");
  if (file.format() == v1::STRUCTURE_FORMAT_JSON ||
      (file.format() == v1::STRUCTURE_FORMAT_UNSPECIFIED && json_name)) {
    v1::Structure message;
    try {
      DecodeMessage(file.content().data(), file.content().size(), NUCLEATE_ENCODING_JSON, name,
                    &message);
      return {{name, FromMessage(message, limits.structure), std::nullopt, {}, name}};
    } catch (const CallFailure& failure) {
      return {{name, std::nullopt, InvalidArgument(name, failure.message), {}, name}};
    } catch (const Error& error) {
      return {{name, std::nullopt, error.WithinField(name), {}, name}};
    }
  }
  structure::io::FileFormat format = structure::io::FileFormat::kFromName;
  switch (file.format()) {
    case v1::STRUCTURE_FORMAT_UNSPECIFIED: break;
    case v1::STRUCTURE_FORMAT_CIF: format = structure::io::FileFormat::kCif; break;
    case v1::STRUCTURE_FORMAT_EXTXYZ: format = structure::io::FileFormat::kExtxyz; break;
    default:
      return {{name, std::nullopt,
               InvalidArgument(name, "format " + v1::StructureFormat_Name(file.format()) +
                                         " cannot be read"),
               {},
               name}};
  }
  std::vector<InputStructure> out;
  for (structure::io::FileStructure& entry : structure::io::ReadStructureFile(
           name, std::string_view(file.content()), format, limits.structure)) {
    std::string source = entry.source;
    out.push_back({std::move(entry.source), std::move(entry.crystal), std::move(entry.error),
                   std::move(entry.warnings), std::move(source)});
  }
  return out;
}

}  // namespace

InputLimits FromMessage(const v1::StructureLimits& m) {
  InputLimits limits;
  using SL = structure::StructureLimits;
  if (m.has_max_atoms()) {
    if (m.max_atoms() < 1) throw InvalidArgument("limits.max_atoms", "must be at least 1");
    if (m.max_atoms() > SL::kCeilingMaxAtoms) {
      throw LimitExceeded("limits.max_atoms",
                          "above the ceiling " + std::to_string(SL::kCeilingMaxAtoms));
    }
    limits.structure.max_atoms = m.max_atoms();
  }
  if (m.has_max_cell_length()) {
    if (!(m.max_cell_length() > 0) || !std::isfinite(m.max_cell_length())) {
      throw InvalidArgument("limits.max_cell_length", "must be a finite number > 0");
    }
    limits.structure.max_cell_length = m.max_cell_length();
  }
  if (m.has_max_structures()) {
    if (m.max_structures() < 1) throw InvalidArgument("limits.max_structures", "must be >= 1");
    limits.max_structures = m.max_structures();
  }
  if (m.has_max_file_bytes()) {
    if (m.max_file_bytes() < 1) throw InvalidArgument("limits.max_file_bytes", "must be >= 1");
    limits.max_file_bytes = m.max_file_bytes();
  }
  return limits;
}

structure::Crystal FromMessage(const v1::Structure& m, const structure::StructureLimits& limits) {
  const int n = m.atomic_numbers_size();
  if (n > limits.max_atoms) {
    throw LimitExceeded("atomic_numbers", std::to_string(n) + " atoms is above limits.max_atoms = " +
                                              std::to_string(limits.max_atoms));
  }
  if (m.lattice_size() != 9) {
    throw InvalidArgument("lattice", "needs 9 numbers (rows a, b, c), got " +
                                         std::to_string(m.lattice_size()));
  }
  if (m.frac_coords_size() != 3 * n) {
    throw InvalidArgument("frac_coords", "needs 3 numbers per atom (" + std::to_string(3 * n) +
                                             "), got " + std::to_string(m.frac_coords_size()));
  }
  structure::Crystal crystal;
  for (int i = 0; i < 3; ++i) {
    for (int j = 0; j < 3; ++j) crystal.lattice(i, j) = m.lattice(3 * i + j);
  }
  crystal.numbers.assign(m.atomic_numbers().begin(), m.atomic_numbers().end());
  crystal.frac.resize(static_cast<std::size_t>(n));
  for (int i = 0; i < n; ++i) {
    for (int k = 0; k < 3; ++k) {
      const double x = m.frac_coords(3 * i + k);
      // Non-finite values pass through unwrapped: the validity check reports them by site.
      crystal.frac[static_cast<std::size_t>(i)][k] = std::isfinite(x) ? structure::WrapFraction(x) : x;
    }
  }
  crystal.label = m.label();
  crystal.properties.insert(m.properties().begin(), m.properties().end());
  return crystal;
}

void ToMessage(const structure::Crystal& crystal, v1::Structure* m) {
  m->Clear();
  for (int i = 0; i < 3; ++i) {
    for (int j = 0; j < 3; ++j) m->add_lattice(crystal.lattice(i, j));
  }
  for (std::size_t i = 0; i < crystal.size(); ++i) {
    m->add_atomic_numbers(crystal.numbers[i]);
    for (int k = 0; k < 3; ++k) m->add_frac_coords(crystal.frac[i][k]);
  }
  m->set_label(crystal.label);
  m->mutable_properties()->insert(crystal.properties.begin(), crystal.properties.end());
}

std::vector<InputStructure> ReadInput(const v1::StructureInput& input, const InputLimits& limits,
                                      const std::string& where) {
  switch (input.source_case()) {
    case v1::StructureInput::kStructure: {
      const std::string field = where + ".structure";
      try {
        return {{input.structure().label().empty() ? where : input.structure().label(),
                 FromMessage(input.structure(), limits.structure), std::nullopt, {}, field}};
      } catch (const Error& error) {
        return {{where, std::nullopt, error.WithinField(field), {}, field}};
      }
    }
    case v1::StructureInput::kFile: {
      std::vector<InputStructure> read = ReadFile(input.file(), limits);
      for (InputStructure& entry : read) {
        entry.field = entry.source;
        // An error about the file as a whole (its name, size or format; no line to point at) is
        // named at the request field that gave it, the file's name kept in the message.
        if (entry.error && entry.error->field() == entry.source) {
          entry.error = Error(entry.error->kind(), where + ".file",
                              entry.source + ": " + entry.error->detail());
        }
      }
      return read;
    }
    case v1::StructureInput::SOURCE_NOT_SET:
      break;
  }
  return {{where, std::nullopt, InvalidArgument(where, "set either structure or file"), {}, where}};
}

structure::Crystal ReadOneStructure(const v1::StructureInput& input, const InputLimits& limits,
                                   const std::string& field) {
  std::vector<InputStructure> read = ReadInput(input, limits, field);
  if (read.size() != 1) {
    throw InvalidArgument(field, "holds " + std::to_string(read.size()) +
                                     " structures; exactly one is needed here");
  }
  RequireValid(&read[0], limits.structure);
  if (read[0].error) throw *read[0].error;
  return std::move(*read[0].crystal);
}

void RequireValid(InputStructure* input, const structure::StructureLimits& limits) {
  if (!input->crystal) return;
  if (auto defect = structure::FindCrystalDefect(*input->crystal, limits)) {
    input->error = defect->error.WithinField(input->field);
    input->crystal.reset();
  }
}

void RequireValid(std::vector<InputStructure>* inputs, const structure::StructureLimits& limits) {
  for (InputStructure& input : *inputs) RequireValid(&input, limits);
}

std::vector<InputStructure> ReadInputs(
    const google::protobuf::RepeatedPtrField<v1::StructureInput>& inputs,
    const InputLimits& limits, const std::string& field) {
  std::vector<InputStructure> out;
  for (int i = 0; i < inputs.size(); ++i) {
    for (InputStructure& entry :
         ReadInput(inputs.Get(i), limits, field + "[" + std::to_string(i) + "]")) {
      out.push_back(std::move(entry));
    }
    if (static_cast<std::int64_t>(out.size()) > limits.max_structures) {
      throw LimitExceeded(field, "more than limits.max_structures = " +
                                     std::to_string(limits.max_structures) + " structures");
    }
  }
  return out;
}

}  // namespace nucleate::capi
