// Protobuf messages and text: libprotobuf refuses proto3 string fields that are not UTF-8, and
// logs to stderr when it meets one, which a library inside someone else's process must not do.
#pragma once

#include <string_view>

#include <google/protobuf/message.h>

namespace nucleate {

// Replaces, in every string field of `message` and of the messages it holds (repeated fields and
// maps included), the bytes that are not UTF-8 with U+FFFD (RepairUtf8). Returns whether any
// field changed. Bytes fields are left alone.
bool RepairStringFields(google::protobuf::Message* message);

// Whether some string field, however deep, is not UTF-8.
bool HasInvalidStringField(const google::protobuf::Message& message);

// ParseFromArray without libprotobuf's log lines on stderr (a string field that is not UTF-8 is
// logged there before the parse fails). false when the bytes do not parse.
bool ParseQuietly(std::string_view bytes, google::protobuf::Message* message);

}  // namespace nucleate
