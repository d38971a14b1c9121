#include "core/model/bundle/bundle_file.h"

#include "core/common/error.h"
#include "core/common/message_text.h"
#include "core/model/bundle/bundle_messages.h"
#include "core/model/bundle/bundle_validation.h"
#include "core/model/bundle/file_io.h"
#include "core/model/bundle/sealed_file.h"
#include "nucleate/v1/model.pb.h"

namespace nucleate::model {
namespace {

void CheckLimits(const BundleLimits& limits) {
  try {
    ValidateBundleLimits(limits);
  } catch (const Error& error) {
    throw error.WithinField("limits");
  }
}

}  // namespace

std::string EncodeModelBundle(const ModelBundle& bundle, const BundleLimits& limits) {
  CheckLimits(limits);
  ValidateModelBundle(bundle, limits);
  v1::ModelBundle message;
  ToMessage(bundle, &message);
  // Names and provenance come from the caller's configuration: a file must stay readable.
  RepairStringFields(&message);
  std::string payload;
  if (!message.SerializeToString(&payload)) {
    throw LimitExceeded("tensors", "the bundle is too large for one file (protobuf's 2 GiB)");
  }
  std::string bytes = SealFile(kModelBundleMagic, kModelBundleFormatVersion, payload);
  if (bytes.size() > limits.max_file_bytes) {
    throw LimitExceeded("tensors", "the bundle file would be " + std::to_string(bytes.size()) +
                                       " bytes, above the limit of " +
                                       std::to_string(limits.max_file_bytes));
  }
  return bytes;
}

ModelBundle DecodeModelBundle(const std::string& bytes, const std::string& source,
                              const BundleLimits& limits,
                              const LayoutForArchitecture& expected_layout) {
  CheckLimits(limits);
  UnsealedFile unsealed = UnsealFile(bytes, kModelBundleMagic, kModelBundleFormatVersion,
                                     limits.max_file_bytes, source);
  v1::ModelBundle message;
  if (!ParseQuietly(unsealed.payload, &message)) {
    throw InvalidArgument(source,
                          "is truncated or damaged: its checksum is right but the model "
                          "bundle inside cannot be parsed");
  }
  unsealed.payload = std::string();  // the message holds the data now
  if (message.format_version() != unsealed.format_version) {
    throw InvalidArgument(source, "is damaged: the bundle says format version " +
                                      std::to_string(message.format_version()) +
                                      ", its container says " +
                                      std::to_string(unsealed.format_version));
  }
  try {
    return FromMessage(message, limits, expected_layout);
  } catch (const Error& error) {
    // The file is what the user names; the field inside it goes into the message.
    throw Error(error.kind(), source,
                error.field().empty() ? error.detail() : error.field() + ": " + error.detail());
  }
}

void SaveModelBundle(const std::string& path, const ModelBundle& bundle,
                     const BundleLimits& limits) {
  WriteFileAtomically(path, EncodeModelBundle(bundle, limits));
}

ModelBundle LoadModelBundle(const std::string& path, const BundleLimits& limits,
                            const LayoutForArchitecture& expected_layout) {
  CheckLimits(limits);
  return DecodeModelBundle(ReadFileWithLimit(path, limits.max_file_bytes), path, limits,
                           expected_layout);
}

}  // namespace nucleate::model
