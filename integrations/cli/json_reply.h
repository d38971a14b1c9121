// Reading replies and writing requests in protobuf JSON, without the message classes: the CLI
// must not compile in its own copy of the nucleate.v1 messages (see capi/CMakeLists.txt).
#pragma once

#include <string>
#include <vector>

#include <yaml-cpp/yaml.h>

namespace nucleate::cli {

// Parses a JSON reply (JSON is valid YAML flow syntax, and yaml-cpp is already a dependency).
YAML::Node ParseJson(const std::string& json);

// A JSON string literal with the escapes JSON requires.
std::string JsonQuote(const std::string& text);

// A double as protobuf JSON writes it: shortest text that reads back to the same value,
// "NaN" / "Infinity" / "-Infinity" quoted.
std::string JsonNumber(double value);

// A reply scalar as a number; protobuf JSON quotes int64 values and non-finite doubles.
double AsDouble(const YAML::Node& node);

}  // namespace nucleate::cli

namespace nucleate::cli {

// Bytes as protobuf JSON writes a bytes field: standard base64 with padding (RFC 4648).
std::string Base64(const std::string& bytes);

// The elements of the array under top-level `key` of a compact JSON object, each as its own JSON
// text, without re-encoding anything (the library's replies are valid JSON).
std::vector<std::string> JsonArrayElements(const std::string& json, const std::string& key);

}  // namespace nucleate::cli
