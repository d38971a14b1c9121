#include "codec.h"

#include <climits>
#include <memory>
#include <string_view>

#include <google/protobuf/stubs/logging.h>
#include <google/protobuf/util/json_util.h>

#include "core/common/error.h"
#include "core/common/message_text.h"

namespace nucleate::capi {

namespace pb = google::protobuf;

std::string EncodeMessage(const pb::Message& message, int32_t encoding) {
  // Error messages and reports quote the caller's bytes (names, labels, keys): a reply must still
  // be valid protobuf, so text that is not UTF-8 goes out with U+FFFD in its place.
  if (HasInvalidStringField(message)) {
    std::unique_ptr<pb::Message> repaired(message.New());
    repaired->CopyFrom(message);
    RepairStringFields(repaired.get());
    return EncodeMessage(*repaired, encoding);
  }
  std::string out;
  if (encoding == NUCLEATE_ENCODING_JSON) {
    pb::util::JsonPrintOptions options;
    options.preserve_proto_field_names = true;
    options.always_print_primitive_fields = true;
    const pb::util::Status status = pb::util::MessageToJsonString(message, &out, options);
    if (!status.ok()) throw Internal("reply could not be printed as JSON: " + status.ToString());
  } else if (!message.SerializeToString(&out)) {
    throw Internal("reply could not be serialised");
  }
  return out;
}

void DecodeMessage(const void* bytes, size_t size, int32_t encoding, const std::string& what,
                   pb::Message* message) {
  const std::string type = message->GetDescriptor()->full_name();
  if (size > static_cast<size_t>(INT_MAX)) {
    throw CallFailure{NUCLEATE_ERROR_LIMIT_EXCEEDED, "",
                      what + " of " + std::to_string(size) + " bytes is too large to parse"};
  }
  if (encoding == NUCLEATE_ENCODING_JSON) {
    // Zero bytes are the empty message in either encoding, as the header promises.
    if (size == 0) return;
    pb::util::JsonParseOptions options;
    options.ignore_unknown_fields = false;
    const pb::LogSilencer quiet;  // libprotobuf would log bad text to stderr before failing
    const pb::util::Status status = pb::util::JsonStringToMessage(
        pb::StringPiece(static_cast<const char*>(bytes), size), message, options);
    if (!status.ok()) {
      throw CallFailure{NUCLEATE_ERROR_MALFORMED_REQUEST, "",
                        what + " is not valid JSON for " + type + ": " +
                            std::string(status.message())};
    }
  } else if (!ParseQuietly(std::string_view(static_cast<const char*>(bytes), size), message)) {
    throw CallFailure{NUCLEATE_ERROR_MALFORMED_REQUEST, "",
                      what + " bytes do not parse as " + type +
                          " (truncated, not this message, or a string field that is not UTF-8)"};
  }
}

}  // namespace nucleate::capi
