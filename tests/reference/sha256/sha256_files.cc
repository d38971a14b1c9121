// Prints nucleate's SHA-256 of each file named on the command line, for sha256_reference.py.
// Usage: sha256_files CHUNK FILE...  Each output line: one-shot digest, then the digest of the
// same bytes fed in pieces of CHUNK bytes, both hex.
#include <cstdio>
#include <cstdlib>
#include <fstream>
#include <iostream>
#include <iterator>
#include <string>

#include "core/common/sha256.h"

int main(int argc, char** argv) {
  if (argc < 3) {
    std::cerr << "usage: sha256_files CHUNK FILE...\n";
    return 2;
  }
  const long chunk = std::strtol(argv[1], nullptr, 10);
  if (chunk < 1) {
    std::cerr << "CHUNK must be >= 1\n";
    return 2;
  }
  for (int i = 2; i < argc; ++i) {
    std::ifstream in(argv[i], std::ios::binary);
    if (!in) {
      std::cerr << "cannot open " << argv[i] << "\n";
      return 1;
    }
    const std::string bytes((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
    nucleate::Sha256Hasher hasher;
    for (std::size_t at = 0; at < bytes.size(); at += static_cast<std::size_t>(chunk)) {
      hasher.Update(bytes.substr(at, static_cast<std::size_t>(chunk)));
    }
    std::cout << nucleate::ToHex(nucleate::Sha256(bytes)) << ' ' << nucleate::ToHex(hasher.Finish())
              << '\n';
  }
  return 0;
}
