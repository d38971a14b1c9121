// nucleate_reply_doubles: numbers out of a reply by field path, for callers with no protobuf.
#include <cstdlib>
#include <string>
#include <vector>

#include <google/protobuf/descriptor.h>
#include <google/protobuf/message.h>

#include "codec.h"
#include "core/common/error.h"
#include "dispatch.h"
#include "out_buffer.h"
#include "status.h"

namespace nucleate::capi {
namespace {

namespace pb = google::protobuf;

double ScalarAsDouble(const pb::Message& message, const pb::FieldDescriptor* field, int index) {
  const pb::Reflection* r = message.GetReflection();
  const bool repeated = field->is_repeated();
  switch (field->cpp_type()) {
    case pb::FieldDescriptor::CPPTYPE_DOUBLE:
      return repeated ? r->GetRepeatedDouble(message, field, index) : r->GetDouble(message, field);
    case pb::FieldDescriptor::CPPTYPE_FLOAT:
      return repeated ? r->GetRepeatedFloat(message, field, index) : r->GetFloat(message, field);
    case pb::FieldDescriptor::CPPTYPE_INT32:
      return repeated ? r->GetRepeatedInt32(message, field, index) : r->GetInt32(message, field);
    case pb::FieldDescriptor::CPPTYPE_INT64:
      return static_cast<double>(repeated ? r->GetRepeatedInt64(message, field, index)
                                          : r->GetInt64(message, field));
    case pb::FieldDescriptor::CPPTYPE_UINT32:
      return repeated ? r->GetRepeatedUInt32(message, field, index) : r->GetUInt32(message, field);
    case pb::FieldDescriptor::CPPTYPE_UINT64:
      return static_cast<double>(repeated ? r->GetRepeatedUInt64(message, field, index)
                                          : r->GetUInt64(message, field));
    case pb::FieldDescriptor::CPPTYPE_BOOL:
      return (repeated ? r->GetRepeatedBool(message, field, index) : r->GetBool(message, field))
                 ? 1.0
                 : 0.0;
    case pb::FieldDescriptor::CPPTYPE_ENUM:
      return repeated ? r->GetRepeatedEnumValue(message, field, index)
                      : r->GetEnumValue(message, field);
    default:
      break;
  }
  throw Internal("not a numeric field");
}

// A path part: a field name, and for a repeated field optionally one element ("structures[2]").
struct PathPart {
  std::string name;
  int index = -1;  // -1: every element
};

PathPart ParsePart(const std::string& text, const std::string& path) {
  const std::size_t open = text.find('[');
  if (open == std::string::npos) return {text, -1};
  char* end = nullptr;
  const long index = std::strtol(text.c_str() + open + 1, &end, 10);
  if (open == 0 || end == text.c_str() + open + 1 || *end != ']' || end[1] != '\0' || index < 0) {
    throw InvalidArgument("path", "'" + path + "': '" + text + "' is not name or name[index]");
  }
  return {text.substr(0, open), static_cast<int>(index)};
}

// Appends the values at parts[depth..] below `message`.
void Collect(const pb::Message& message, const std::vector<std::string>& parts, size_t depth,
             const std::string& path_so_far, std::vector<double>* out) {
  const pb::Descriptor* type = message.GetDescriptor();
  const std::string here = path_so_far.empty() ? parts[depth] : path_so_far + "." + parts[depth];
  const PathPart part = ParsePart(parts[depth], here);
  const pb::FieldDescriptor* field = type->FindFieldByName(part.name);
  if (field == nullptr) {
    throw InvalidArgument("path", "'" + here + "': " + type->full_name() + " has no field '" +
                                      part.name + "'");
  }
  if (part.index >= 0 && !field->is_repeated()) {
    throw InvalidArgument("path", "'" + here + "': '" + part.name + "' is not repeated");
  }
  const pb::Reflection* r = message.GetReflection();
  const bool last = depth + 1 == parts.size();
  const bool is_message = field->cpp_type() == pb::FieldDescriptor::CPPTYPE_MESSAGE;
  if (last == is_message || field->is_map()) {
    throw InvalidArgument("path", "'" + here + "' " +
                                      (last ? "is not a numeric field" : "has no fields below it"));
  }
  // The elements to visit: all of a repeated field, or the one indexed (none if out of range).
  int first = 0, end = field->is_repeated() ? r->FieldSize(message, field) : 1;
  if (part.index >= 0) {
    if (part.index >= end) {
      throw InvalidArgument("path", "'" + here + "': index " + std::to_string(part.index) +
                                        " is past the " + std::to_string(end) + " elements");
    }
    first = part.index;
    end = part.index + 1;
  }
  if (last) {
    for (int i = first; i < end; ++i) out->push_back(ScalarAsDouble(message, field, i));
    return;
  }
  if (field->is_repeated()) {
    for (int i = first; i < end; ++i) {
      Collect(r->GetRepeatedMessage(message, field, i), parts, depth + 1, here, out);
    }
  } else {
    Collect(r->GetMessage(message, field), parts, depth + 1, here, out);
  }
}

std::vector<std::string> SplitPath(const std::string& path) {
  std::vector<std::string> parts;
  size_t start = 0;
  while (true) {
    const size_t dot = path.find('.', start);
    parts.push_back(path.substr(start, dot - start));
    if (parts.back().empty()) throw InvalidArgument("path", "'" + path + "' has an empty part");
    if (dot == std::string::npos) return parts;
    start = dot + 1;
  }
}

std::vector<double> ReplyDoubles(const char* method, const void* reply, size_t reply_size,
                                 int32_t encoding, const char* path) {
  if (method == nullptr || path == nullptr || (reply == nullptr && reply_size != 0)) {
    throw CallFailure{NUCLEATE_ERROR_NULL_ARGUMENT, "", "method, path or reply is NULL"};
  }
  if (encoding != NUCLEATE_ENCODING_BINARY && encoding != NUCLEATE_ENCODING_JSON) {
    throw CallFailure{NUCLEATE_ERROR_BAD_ENCODING, "",
                      "encoding " + std::to_string(encoding) + " is neither binary (0) nor JSON (1)"};
  }
  const MethodEntry* entry = FindMethod(method);
  if (entry == nullptr) {
    throw CallFailure{NUCLEATE_ERROR_UNKNOWN_METHOD, "",
                      "unknown method '" + std::string(method) + "'"};
  }
  std::unique_ptr<pb::Message> parsed(entry->reply_prototype().New());
  DecodeMessage(reply == nullptr ? "" : reply, reply_size, encoding,
                std::string(method) + ": reply", parsed.get());
  std::vector<double> values;
  Collect(*parsed, SplitPath(path), 0, "", &values);
  return values;
}

}  // namespace
}  // namespace nucleate::capi

extern "C" nucleate_status nucleate_reply_doubles(const char* method, const void* reply,
                                                  size_t reply_size, int32_t encoding,
                                                  const char* path, double** values,
                                                  size_t* count, char** message) {
  using namespace nucleate::capi;
  if (values == nullptr || count == nullptr) return NUCLEATE_ERROR_NULL_ARGUMENT;
  nucleate_status status = NUCLEATE_OK;
  std::string text;
  try {
    const std::vector<double> found = ReplyDoubles(method, reply, reply_size, encoding, path);
    double* out = nullptr;
    if (!found.empty()) {
      out = reinterpret_cast<double*>(CopyOut(found.data(), found.size() * sizeof(double)));
      if (out == nullptr) return NUCLEATE_ERROR_OUT_OF_MEMORY;
    }
    *values = out;
    *count = found.size();
    if (message != nullptr) *message = nullptr;
    return NUCLEATE_OK;
  } catch (const CallFailure& failure) {
    status = failure.status;
    text = failure.message;
  } catch (const nucleate::Error& error) {
    status = StatusForErrorKind(error.kind());
    text = error.message();
  } catch (const std::bad_alloc&) {
    return NUCLEATE_ERROR_OUT_OF_MEMORY;
  } catch (...) {
    status = NUCLEATE_ERROR_INTERNAL;
    text = "internal error";
  }
  if (message != nullptr) *message = CopyOut("nucleate_reply_doubles: " + text);
  return status;
}
