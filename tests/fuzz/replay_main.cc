// A main for a fuzz target without libFuzzer: runs LLVMFuzzerTestOneInput once on every file named
// (a folder: every file in it, in name order). The seed corpora and the inputs the fuzzers found
// (findings/) thereby run as ordinary regression tests in every build, the gcc and sanitizer
// builds of the suite included, where libFuzzer is not available.
#include <algorithm>
#include <cstddef>
#include <cstdint>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <iterator>
#include <string>
#include <vector>

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size);
// Optional in a target; weak, so a target without it still links.
extern "C" int LLVMFuzzerInitialize(int* argc, char*** argv) __attribute__((weak));

namespace {

std::vector<std::filesystem::path> InputsOf(const std::filesystem::path& path) {
  if (!std::filesystem::is_directory(path)) return {path};
  std::vector<std::filesystem::path> files;
  for (const auto& entry : std::filesystem::directory_iterator(path)) {
    // README.md and other notes beside the inputs are not inputs.
    if (entry.is_regular_file() && entry.path().extension() != ".md") files.push_back(entry.path());
  }
  std::sort(files.begin(), files.end());
  return files;
}

}  // namespace

int main(int argc, char** argv) {
  if (argc < 2) {
    std::fprintf(stderr, "usage: %s FILE_OR_FOLDER...\n", argv[0]);
    return 2;
  }
  if (LLVMFuzzerInitialize) LLVMFuzzerInitialize(&argc, &argv);
  int ran = 0;
  for (int a = 1; a < argc; ++a) {
    if (!std::filesystem::exists(argv[a])) {
      std::fprintf(stderr, "replay: %s does not exist\n", argv[a]);
      return 2;
    }
    for (const std::filesystem::path& file : InputsOf(argv[a])) {
      std::ifstream in(file, std::ios::binary);
      const std::string bytes((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
      if (!in.good() && !in.eof()) {
        std::fprintf(stderr, "replay: cannot read %s\n", file.c_str());
        return 2;
      }
      // Named first, so a hang or crash shows which input caused it.
      std::printf("%s (%zu bytes)\n", file.c_str(), bytes.size());
      std::fflush(stdout);
      LLVMFuzzerTestOneInput(reinterpret_cast<const uint8_t*>(bytes.data()), bytes.size());
      ++ran;
    }
  }
  std::printf("replayed %d inputs\n", ran);
  return ran > 0 ? 0 : 1;
}
