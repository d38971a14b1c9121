// The members of one JSON object as raw text, so a structure from a reply can be passed on to the
// next request byte for byte (no re-encoding of its doubles).
#pragma once

#include <map>
#include <string>

namespace nucleate::cli {

// Top-level members of the JSON object `object_json`: key -> the value's JSON text. The library's
// replies are valid JSON; throws std::runtime_error if `object_json` is not an object.
std::map<std::string, std::string> JsonObjectMembers(const std::string& object_json);

}  // namespace nucleate::cli
