#include "core/common/message_text.h"

#include <climits>
#include <string>

#include <google/protobuf/reflection.h>
#include <google/protobuf/stubs/logging.h>

#include "core/common/utf8.h"

namespace nucleate {
namespace {

namespace pb = google::protobuf;

// Visits every string field of `message`, recursively, calling `on_string()` for each one that is
// not UTF-8 (false stops the walk). With `mutable_message` (the same message, writable) each such
// field is then repaired in place.
template <typename OnString>
bool VisitStrings(const pb::Message& message, pb::Message* mutable_message, const OnString& on_string) {
  const pb::Descriptor* descriptor = message.GetDescriptor();
  const pb::Reflection* reflection = message.GetReflection();
  for (int f = 0; f < descriptor->field_count(); ++f) {
    const pb::FieldDescriptor* field = descriptor->field(f);
    const bool is_string = field->type() == pb::FieldDescriptor::TYPE_STRING;
    const bool is_message = field->cpp_type() == pb::FieldDescriptor::CPPTYPE_MESSAGE;
    if (!is_string && !is_message) continue;
    if (field->is_repeated()) {
      const int n = reflection->FieldSize(message, field);
      for (int i = 0; i < n; ++i) {
        if (is_string) {
          std::string scratch;
          const std::string& text = reflection->GetRepeatedStringReference(message, field, i, &scratch);
          if (IsValidUtf8(text)) continue;
          if (!on_string()) return false;
          if (mutable_message) reflection->SetRepeatedString(mutable_message, field, i, RepairUtf8(text));
        } else {
          const pb::Message& inner = reflection->GetRepeatedMessage(message, field, i);
          pb::Message* mutable_inner =
              mutable_message ? reflection->MutableRepeatedMessage(mutable_message, field, i) : nullptr;
          if (!VisitStrings(inner, mutable_inner, on_string)) return false;
        }
      }
    } else if (reflection->HasField(message, field)) {  // an empty string is valid anyway
      if (is_string) {
        std::string scratch;
        const std::string& text = reflection->GetStringReference(message, field, &scratch);
        if (IsValidUtf8(text)) continue;
        if (!on_string()) return false;
        if (mutable_message) reflection->SetString(mutable_message, field, RepairUtf8(text));
      } else {
        const pb::Message& inner = reflection->GetMessage(message, field);
        pb::Message* mutable_inner =
            mutable_message ? reflection->MutableMessage(mutable_message, field) : nullptr;
        if (!VisitStrings(inner, mutable_inner, on_string)) return false;
      }
    }
  }
  return true;
}

}  // namespace

bool RepairStringFields(pb::Message* message) {
  bool changed = false;
  VisitStrings(*message, message, [&] {
    changed = true;
    return true;
  });
  return changed;
}

bool HasInvalidStringField(const pb::Message& message) {
  bool found = false;
  VisitStrings(message, nullptr, [&] {
    found = true;
    return false;
  });
  return found;
}

bool ParseQuietly(std::string_view bytes, pb::Message* message) {
  if (bytes.size() > static_cast<std::size_t>(INT_MAX)) return false;
  // Process-wide while it lives (libprotobuf has no per-call switch); it only drops log lines.
  const pb::LogSilencer quiet;
  return message->ParseFromArray(bytes.data(), static_cast<int>(bytes.size()));
}

}  // namespace nucleate
