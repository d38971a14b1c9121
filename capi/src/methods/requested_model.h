// The model file a request names: read and checked by core, with its errors (cannot open, not a
// model file, corrupted) reported against the request field that named the file, e.g.
// ErrorDetail.field "model_path" and the message "model_path: /runs/m.nucleate: cannot open ...",
// so a caller's error handling points at what to change in its request.
#pragma once

#include <string>

#include "core/model/bundle/model_bundle.h"

namespace nucleate::capi {

model::ModelBundle LoadRequestedModel(const std::string& path, const char* field);

}  // namespace nucleate::capi
