#include "methods/requested_model.h"

#include "core/common/error.h"
#include "core/model/bundle/bundle_file.h"

namespace nucleate::capi {

model::ModelBundle LoadRequestedModel(const std::string& path, const char* field) {
  try {
    return model::LoadModelBundle(path);
  } catch (const Error& e) {
    // Core names the file as the field (it knows no request); the request knows which field.
    if (e.field() != path) throw;
    throw Error(e.kind(), field, path + ": " + e.detail());
  }
}

}  // namespace nucleate::capi
