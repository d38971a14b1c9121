// yaml-cpp (0.7) accepts a quoted scalar that is never closed, taking the rest of the file as its
// text, where YAML 1.2 requires the closing quote. This finds such a scalar in a parsed document.
#pragma once

#include <string>

#include <yaml-cpp/yaml.h>

namespace nucleate::train {

// Throws InvalidArgument with field "<source>:<line>" ("not valid YAML: ...") when a quoted
// scalar of `root`, parsed from `text`, has no closing quote. Each node is looked at once (an
// alias does not repeat the work), so the cost is linear in the text.
void RefuseUnclosedQuotes(const YAML::Node& root, const std::string& text,
                          const std::string& source);

}  // namespace nucleate::train
