// Feeds ReadExtxyz (core/structure/io/extxyz.h) arbitrary text with the default limits. Extended
// XYZ files come from simulation codes and scripts and carry free-form key=value comment lines
// (quoted strings, arrays, Properties column specs), the most hand-parsed part of any reader here.
// Besides crashes, it checks the reader's promises (reader_invariants.h): nucleate::Error escaping
// ReadExtxyz is one of them, since the header says it never throws for content.
// Inputs are capped at 16384 bytes (-max_len): room for a few frames of some dozens of atoms.
#include <cstddef>
#include <cstdint>
#include <string>
#include <string_view>

#include "core/structure/io/extxyz.h"
#include "reader_invariants.h"

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  namespace io = nucleate::structure::io;
  const std::string_view text(reinterpret_cast<const char*>(data), size);
  const io::ExtxyzReadOptions options;
  try {
    for (const io::ExtxyzFrameResult& frame : io::ReadExtxyz(text, "fuzz.xyz", options)) {
      nucleate::fuzz::CheckReaderResult(frame.crystal, frame.error, options.limits,
                                        "frame " + std::to_string(frame.frame) + " at line " +
                                            std::to_string(frame.line));
    }
  } catch (const nucleate::Error& error) {
    nucleate::fuzz::BrokenPromise(std::string("ReadExtxyz threw for content: ") + error.what());
  }
  return 0;
}
