// UTF-8 well-formedness (RFC 3629: no overlong forms, no surrogates, nothing above U+10FFFF).
// Protobuf string fields must hold valid UTF-8, and error messages quote the caller's bytes (file
// names, labels, unknown keys), so text crossing into a message is checked and repaired here.
#pragma once

#include <string>
#include <string_view>

namespace nucleate {

bool IsValidUtf8(std::string_view text);

// `text` with each ill-formed part replaced by one U+FFFD, following the Unicode practice of
// substituting maximal subparts (Unicode 15.0, section 3.9), as Python's decode(errors="replace")
// and most browsers do; valid text comes back unchanged.
std::string RepairUtf8(std::string_view text);

}  // namespace nucleate
