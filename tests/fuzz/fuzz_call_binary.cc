// Feeds nucleate_call binary protobuf requests: byte 0 picks the method (call_fuzzing.h), the rest
// is the encoded request. Binary requests come from programs (the MPI driver, plugins, other
// languages' protobuf libraries), and a truncated or corrupted message must give a status, never a
// crash; mutations here also reach field values the JSON parser would refuse earlier.
// Inputs are capped at 4096 bytes (-max_len), as for fuzz_call_json.cc: bigger requests mostly
// make methods slower (their work grows with the structures given) without reaching new code.
#include <cstddef>
#include <cstdint>

#include "call_fuzzing.h"

extern "C" int LLVMFuzzerInitialize(int*, char***) {
  nucleate::fuzz::CheckMethodListAgainstVersion();
  return 0;
}

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  nucleate::fuzz::CallWithFuzzInput(data, size, NUCLEATE_ENCODING_BINARY);
  return 0;
}
