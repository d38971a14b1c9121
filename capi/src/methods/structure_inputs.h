// Structure messages <-> core crystals, and the inputs of a request (structures given directly or
// file contents) read into one list. The only code that converts structure messages.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include <google/protobuf/repeated_field.h>

#include "core/common/error.h"
#include "core/structure/crystal.h"
#include "nucleate/v1/structure.pb.h"

namespace nucleate::capi {

// Request-wide sizes: per structure (core's StructureLimits) and per request.
struct InputLimits {
  static constexpr std::int64_t kDefaultMaxStructures = 1000000;
  static constexpr std::int64_t kDefaultMaxFileBytes = std::int64_t{256} << 20;
  structure::StructureLimits structure;
  std::int64_t max_structures = kDefaultMaxStructures;
  std::int64_t max_file_bytes = kDefaultMaxFileBytes;
};

// Defaults for what is left out; InvalidArgument / LimitExceeded naming "limits.<field>".
InputLimits FromMessage(const v1::StructureLimits& message);

// InvalidArgument naming the field ("lattice", "frac_coords") when the sizes disagree, and
// LimitExceeded when the atom count is above the limit (checked before anything is copied).
// Coordinates are wrapped into [0, 1).
structure::Crystal FromMessage(const v1::Structure& message, const structure::StructureLimits& limits);
void ToMessage(const structure::Crystal& crystal, v1::Structure* message);

// One structure of the request, in order: read, or the error that made it unusable.
struct InputStructure {
  std::string source;  // "inputs[3]", or the file's source "<name>#<block>" / "<name>@<frame>"
  std::optional<structure::Crystal> crystal;
  std::optional<Error> error;
  std::vector<std::string> warnings;
  // Where a defect of the crystal is reported: the request path of a structure given inline
  // ("inputs[3].structure"), the file's source for one read from a file.
  std::string field;
};

// Every method but Check refuses what Check would report as a defect (core's ValidateCrystal):
// the input's crystal is replaced by its error, named inside input->field, e.g.
// "inputs[3].structure.frac_coords[5]". Inputs already in error are left alone.
void RequireValid(InputStructure* input, const structure::StructureLimits& limits);
void RequireValid(std::vector<InputStructure>* inputs, const structure::StructureLimits& limits);

// The structures of one input (a file may hold several); `where` names it in sources and errors
// ("a", "inputs[3]"). A bad structure or file becomes an entry with its error.
std::vector<InputStructure> ReadInput(const v1::StructureInput& input, const InputLimits& limits,
                                      const std::string& where);

// The one structure an input must hold (a file with one block or frame), valid (RequireValid);
// InvalidArgument naming `field` otherwise, or the structure's own error.
structure::Crystal ReadOneStructure(const v1::StructureInput& input, const InputLimits& limits,
                                   const std::string& field);

// Every input of a repeated field named `field` ("inputs", "references"), in order.
// LimitExceeded (a refusal of the whole request) only when there are more structures than
// limits.max_structures.
std::vector<InputStructure> ReadInputs(
    const google::protobuf::RepeatedPtrField<v1::StructureInput>& inputs,
    const InputLimits& limits, const std::string& field = "inputs");

}  // namespace nucleate::capi
