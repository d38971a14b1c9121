// Feeds nucleate_call protobuf-JSON requests: byte 0 picks the method (call_fuzzing.h), the rest
// is the request text. JSON is what the CLI, the Python and Fortran examples and most users send,
// typed or generated, so its parser and every method behind it must take any text.
// Inputs are capped at 4096 bytes (-max_len): larger ones mostly spend time in the JSON parser
// and in methods whose work grows with the structures given (Dedup compares every pair), which
// slows the search without reaching new code.
#include <cstddef>
#include <cstdint>

#include "call_fuzzing.h"

extern "C" int LLVMFuzzerInitialize(int*, char***) {
  nucleate::fuzz::CheckMethodListAgainstVersion();
  return 0;
}

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  nucleate::fuzz::CallWithFuzzInput(data, size, NUCLEATE_ENCODING_JSON);
  return 0;
}
