// Feeds ReadCif (core/structure/io/cif_reader.h) arbitrary text with the default limits. CIF files
// come from databases, other programs and hand edits, and the Check, Convert, Match and Dedup
// methods and training read them: the tokenizer, loop handling, symmetry-operation parser and
// site expansion must take any bytes. Besides crashes, it checks the reader's promises
// (reader_invariants.h): nucleate::Error escaping ReadCif is one of them, since the header says
// it never throws for file content.
// Inputs are capped at 16384 bytes (-max_len): enough for several blocks with symmetry loops,
// while the per-input time stays small (site expansion grows with operations times sites).
#include <cstddef>
#include <cstdint>
#include <string>
#include <string_view>

#include "core/structure/io/cif_reader.h"
#include "reader_invariants.h"

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  namespace io = nucleate::structure::io;
  const std::string_view text(reinterpret_cast<const char*>(data), size);
  const io::CifReadOptions options;
  try {
    for (const io::CifBlockResult& block : io::ReadCif(text, "fuzz.cif", options)) {
      nucleate::fuzz::CheckReaderResult(block.crystal, block.error, options.limits,
                                        "block '" + block.block_name + "' at line " +
                                            std::to_string(block.line));
    }
  } catch (const nucleate::Error& error) {
    nucleate::fuzz::BrokenPromise(std::string("ReadCif threw for file content: ") + error.what());
  }
  return 0;
}
