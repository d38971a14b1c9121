// Feeds DecodeModelBundle (core/model/bundle/bundle_file.h), the loader behind ModelInfo,
// Evaluate, Sample, Assess and checkpoints. Model files are passed around between users and
// machines, so a truncated, corrupted or hostile file must give an error, never a crash or an
// allocation sized by an unchecked number. The input's first byte picks how the rest is used:
//   even: the rest is the file's bytes as they are (the sealed container: magic, format version,
//         SHA-256, payload);
//   odd:  the rest is the payload, sealed here with a correct checksum. Mutations of a whole file
//         almost always break its SHA-256 and stop at "corrupted"; sealing them afresh lets them
//         reach the ModelBundle message and every check on architecture, schedules and tensors.
// A bundle that decodes must also encode and decode again: bundle_file.h promises that whatever is
// written can be read back, and the same validation guards both ways.
// Inputs are capped at 16384 bytes (-max_len): the committed tiny model is 7101 bytes.
#include <cstddef>
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <string>

#include "core/common/error.h"
#include "core/model/bundle/bundle_file.h"
#include "core/model/bundle/sealed_file.h"

namespace {

[[noreturn]] void BrokenPromise(const std::string& what) {
  std::fprintf(stderr, "model bundle promise broken: %s\n", what.c_str());
  std::abort();
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  namespace model = nucleate::model;
  if (size == 0) return 0;
  const std::string rest(reinterpret_cast<const char*>(data) + 1, size - 1);
  const bool seal_here = (data[0] & 1) != 0;
  const std::string bytes =
      seal_here ? model::SealFile(model::kModelBundleMagic, model::kModelBundleFormatVersion, rest)
                : rest;
  model::ModelBundle bundle;
  try {
    bundle = model::DecodeModelBundle(bytes, "fuzz.nucleate");
  } catch (const nucleate::Error&) {
    return 0;  // refused with a message: what should happen to a bad file
  }
  try {
    model::DecodeModelBundle(model::EncodeModelBundle(bundle), "fuzz re-encoded");
  } catch (const nucleate::Error& error) {
    BrokenPromise(std::string("a decoded bundle does not encode and decode again: ") +
                  error.what());
  }
  return 0;
}
