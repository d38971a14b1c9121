// Feeds ReadTrainConfig (core/train/train_config.h) arbitrary YAML text: the training job file,
// written by hand, read by `nucleate train` and by the Train and Assess methods (as config_yaml
// in a request). yaml-cpp parses it, and the reader walks the node tree key by key, so both the
// parser and every type and range check see the bytes.
// train_config.h says errors are nucleate::Error (InvalidArgument naming file, line and key).
// Anything else escaping (a YAML::Exception the reader forgot to translate, std::exception) breaks
// that promise: callers catch nucleate::Error to map it to a status, and the C boundary would
// report the rest as INTERNAL. Such an escape is printed ("ESCAPED ...", with the input) the first
// few times per exception type, and fuzzing goes on so that crashes behind it are still found;
// with NUCLEATE_FUZZ_ABORT_ON_ESCAPE=1 in the environment it aborts instead, and libFuzzer saves
// the input.
// Inputs are capped at 4096 bytes (-max_len): a configuration is a few dozen lines.
#include <cstddef>
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <exception>
#include <map>
#include <string>
#include <typeinfo>

#include <yaml-cpp/exceptions.h>

#include "core/common/error.h"
#include "core/train/train_config.h"

namespace {

constexpr int kEscapesPrintedPerType = 3;

// The input as one C string literal, so a finding can be copied from the log.
std::string Escaped(const std::string& text) {
  std::string out = "\"";
  for (unsigned char c : text) {
    if (c == '"' || c == '\\') {
      out += '\\';
      out += static_cast<char>(c);
    } else if (c >= 0x20 && c < 0x7f) {
      out += static_cast<char>(c);
    } else {
      char octal[8];
      std::snprintf(octal, sizeof octal, "\\%03o", c);
      out += octal;
    }
  }
  return out + "\"";
}

void ReportEscape(const std::exception& escaped, const std::string& input) {
  static std::map<std::string, int> printed;  // per exception type
  if (std::getenv("NUCLEATE_FUZZ_ABORT_ON_ESCAPE") != nullptr) {
    std::fprintf(stderr, "ESCAPED %s: %s\n", typeid(escaped).name(), escaped.what());
    std::abort();
  }
  if (printed[typeid(escaped).name()]++ >= kEscapesPrintedPerType) return;
  std::fprintf(stderr, "ESCAPED %s: %s\nESCAPED input: %s\n", typeid(escaped).name(),
               escaped.what(), Escaped(input).c_str());
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  const std::string yaml(reinterpret_cast<const char*>(data), size);
  try {
    nucleate::train::ReadTrainConfig(yaml, "/nonexistent/fuzz", "fuzz.yaml");
  } catch (const nucleate::Error&) {
    // refused with a message naming file, line and key: what should happen to bad YAML
  } catch (const YAML::Exception& escaped) {
    ReportEscape(escaped, yaml);
  } catch (const std::exception& escaped) {
    ReportEscape(escaped, yaml);
  }
  return 0;
}
