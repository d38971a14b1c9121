#include "json_members.h"

#include <cctype>
#include <stdexcept>

namespace nucleate::cli {
namespace {

std::size_t SkipSpace(const std::string& json, std::size_t i) {
  while (i < json.size() && std::isspace(static_cast<unsigned char>(json[i]))) ++i;
  return i;
}

// The position just past the string that starts at json[i] (a '"').
std::size_t StringEnd(const std::string& json, std::size_t i) {
  for (++i; i < json.size(); ++i) {
    if (json[i] == '\\')
      ++i;
    else if (json[i] == '"')
      return i + 1;
  }
  throw std::runtime_error("JSON text ends inside a string");
}

// The position just past the value that starts at json[i].
std::size_t ValueEnd(const std::string& json, std::size_t i) {
  if (json[i] == '"') return StringEnd(json, i);
  int depth = 0;
  for (; i < json.size(); ++i) {
    const char c = json[i];
    if (c == '"') {
      i = StringEnd(json, i) - 1;
    } else if (c == '{' || c == '[') {
      ++depth;
    } else if (c == '}' || c == ']') {
      if (depth == 0) return i;  // the enclosing object's end: a bare value stops here
      if (--depth == 0) return i + 1;
    } else if (c == ',' && depth == 0) {
      return i;
    }
  }
  return i;
}

}  // namespace

std::map<std::string, std::string> JsonObjectMembers(const std::string& object_json) {
  const std::string& json = object_json;
  std::size_t i = SkipSpace(json, 0);
  if (i >= json.size() || json[i] != '{') throw std::runtime_error("expected a JSON object");
  std::map<std::string, std::string> members;
  i = SkipSpace(json, i + 1);
  while (i < json.size() && json[i] != '}') {
    if (json[i] != '"') throw std::runtime_error("expected a key in a JSON object");
    const std::size_t key_end = StringEnd(json, i);
    // Keys of protobuf JSON are field names: no escapes to undo.
    const std::string key = json.substr(i + 1, key_end - i - 2);
    i = SkipSpace(json, key_end);
    if (i >= json.size() || json[i] != ':') throw std::runtime_error("expected ':' after a key");
    const std::size_t value_start = SkipSpace(json, i + 1);
    const std::size_t value_end = ValueEnd(json, value_start);
    std::size_t trimmed = value_end;
    while (trimmed > value_start && std::isspace(static_cast<unsigned char>(json[trimmed - 1]))) {
      --trimmed;
    }
    members[key] = json.substr(value_start, trimmed - value_start);
    i = SkipSpace(json, value_end);
    if (i < json.size() && json[i] == ',') i = SkipSpace(json, i + 1);
  }
  if (i >= json.size()) throw std::runtime_error("JSON object is not closed");
  return members;
}

}  // namespace nucleate::cli
