// The model bundle file: a ModelBundle message sealed with magic "nucleate-model"
// (schemas/nucleate/v1/model.proto, sealed_file.h).
#pragma once

#include <string>

#include "core/model/bundle/bundle_limits.h"
#include "core/model/bundle/model_bundle.h"

namespace nucleate::model {

inline constexpr char kModelBundleMagic[] = "nucleate-model";

// The bytes of a bundle file. The bundle is checked first (ValidateModelBundle), so every file
// written can be read back; errors name the field inside the bundle.
std::string EncodeModelBundle(const ModelBundle& bundle, const BundleLimits& limits = {});

// Reads the bytes of a bundle file. Every error names `source` as its field and says what is
// wrong: too large (LimitExceeded), not a model file, truncated, corrupted (checksum), a newer
// format version (Unsupported), or a field inside the bundle that is invalid
// ("architecture.hidden: ...", "tensors[3]: ... not finite", ...). When expected_layout is given,
// the tensors must have exactly its names and shapes, and the bundle's layout is the one it
// returns; otherwise the layout is rebuilt from the file.
ModelBundle DecodeModelBundle(const std::string& bytes, const std::string& source,
                              const BundleLimits& limits = {},
                              const LayoutForArchitecture& expected_layout = {});

// Writes atomically (path.tmp, then rename): a crash never leaves half a model under `path`.
void SaveModelBundle(const std::string& path, const ModelBundle& bundle,
                     const BundleLimits& limits = {});

// The file's size is checked against limits.max_file_bytes before it is read. Errors as for
// DecodeModelBundle, with the path as the field; kIo when the file cannot be read.
ModelBundle LoadModelBundle(const std::string& path, const BundleLimits& limits = {},
                            const LayoutForArchitecture& expected_layout = {});

}  // namespace nucleate::model
