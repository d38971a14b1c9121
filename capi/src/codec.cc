#include "codec.h"

#include <climits>
#include <map>
#include <memory>
#include <string_view>
#include <vector>

#include <google/protobuf/stubs/logging.h>
#include <google/protobuf/unknown_field_set.h>
#include <google/protobuf/util/json_util.h>

#include "core/common/error.h"
#include "core/common/message_text.h"
#include "core/common/utf8.h"

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

namespace {

// The path of the first field the parser kept as unknown: a known field that arrived with the
// wrong wire type ("variance.steps"), or a number the message never had ("variance.#7"); empty
// if none.
std::string FirstUnknownField(const pb::Message& message) {
  const pb::Reflection* reflection = message.GetReflection();
  const pb::UnknownFieldSet& unknown = reflection->GetUnknownFields(message);
  if (unknown.field_count() > 0) {
    const int number = unknown.field(0).number();
    // A number the message knows arrived with another wire type: name the field.
    const pb::FieldDescriptor* known = message.GetDescriptor()->FindFieldByNumber(number);
    return known ? known->name() : "#" + std::to_string(number);
  }
  std::vector<const pb::FieldDescriptor*> fields;
  reflection->ListFields(message, &fields);
  for (const pb::FieldDescriptor* field : fields) {
    if (field->cpp_type() != pb::FieldDescriptor::CPPTYPE_MESSAGE) continue;
    const int n = field->is_repeated() ? reflection->FieldSize(message, field) : 1;
    for (int i = 0; i < n; ++i) {
      const pb::Message& inner = field->is_repeated() ? reflection->GetRepeatedMessage(message, field, i)
                                                      : reflection->GetMessage(message, field);
      const std::string below = FirstUnknownField(inner);
      if (below.empty()) continue;
      return field->name() + (field->is_repeated() ? "[" + std::to_string(i) + "]" : "") + "." + below;
    }
  }
  return "";
}

// Why binary bytes failed to parse, when the cause is text: the path of the first string field
// whose bytes are not UTF-8 ("inputs[0].file.name"), found by reading the bytes as raw fields
// (which checks no text) alongside the message's descriptor. Empty if the bytes are broken
// otherwise.
std::string FirstInvalidUtf8Field(std::string_view bytes, const pb::Descriptor* type, int depth = 0) {
  pb::UnknownFieldSet raw;
  if (depth > 32 || !raw.ParseFromArray(bytes.data(), static_cast<int>(bytes.size()))) return "";
  std::map<int, int> seen;  // occurrences per field number: the index of a repeated field
  for (int i = 0; i < raw.field_count(); ++i) {
    const pb::UnknownField& f = raw.field(i);
    const int occurrence = seen[f.number()]++;
    const pb::FieldDescriptor* field = type->FindFieldByNumber(f.number());
    if (field == nullptr || f.type() != pb::UnknownField::TYPE_LENGTH_DELIMITED) continue;
    const std::string name =
        field->name() + (field->is_repeated() ? "[" + std::to_string(occurrence) + "]" : "");
    if (field->type() == pb::FieldDescriptor::TYPE_STRING && !IsValidUtf8(f.length_delimited())) {
      return name;
    }
    if (field->type() == pb::FieldDescriptor::TYPE_MESSAGE) {
      const std::string below =
          FirstInvalidUtf8Field(f.length_delimited(), field->message_type(), depth + 1);
      if (!below.empty()) return name + "." + below;
    }
  }
  return "";
}

}  // namespace

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
    const std::string text_field = FirstInvalidUtf8Field(
        std::string_view(static_cast<const char*>(bytes), size), message->GetDescriptor());
    if (!text_field.empty()) {
      throw CallFailure{NUCLEATE_ERROR_MALFORMED_REQUEST, text_field,
                        what + ": string field " + text_field + " of " + type +
                            " is not UTF-8 (proto3 strings must be; send such bytes another way)"};
    }
    throw CallFailure{NUCLEATE_ERROR_MALFORMED_REQUEST, "",
                      what + " bytes do not parse as " + type + " (truncated or not this message)"};
  }
  if (encoding != NUCLEATE_ENCODING_JSON) {
    // As for unknown JSON fields: a field this library does not know, or a known one sent with
    // the wrong wire type, would otherwise be dropped silently and its default used.
    const std::string unknown = FirstUnknownField(*message);
    if (!unknown.empty()) {
      throw CallFailure{NUCLEATE_ERROR_MALFORMED_REQUEST, unknown,
                        what + " holds " + unknown + " with a field number or wire type that " +
                            type + " does not have (a newer or different schema?)"};
    }
  }
}

}  // namespace nucleate::capi
