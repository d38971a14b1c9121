// Element symbols given on the command line (or in a job file) as atomic numbers. The library
// holds the one periodic table; the CLI has no copy of it and asks through the C ABI instead.
#pragma once

#include <string>

namespace nucleate::cli {

// The atomic number of `symbol` (e.g. "Li" -> 3); a plain number is taken as an atomic number
// as it is (the library checks its range). Throws CLI::ValidationError naming `origin` (a flag
// such as "--elements", or a job file's "file:line: key") for anything else.
int AtomicNumber(const std::string& symbol, const std::string& origin);

}  // namespace nucleate::cli
