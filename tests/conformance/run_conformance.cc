// The conformance suite from C++ through the C ABI only (a process that loads libnucleate must
// not compile in the nucleate.v1 protobuf classes). Mirrors run_conformance.c.
// Usage: run_conformance_cxx CASES_DIR [EXPECTED_CASE_COUNT]
#include <algorithm>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <iostream>
#include <iterator>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include <nucleate/nucleate.h>

namespace {

namespace fs = std::filesystem;

std::optional<std::string> ReadFile(const fs::path& path) {
  std::ifstream stream(path, std::ios::binary);
  if (!stream) return std::nullopt;
  return std::string(std::istreambuf_iterator<char>(stream), std::istreambuf_iterator<char>());
}

std::string WithoutFinalNewline(std::string text) {
  if (!text.empty() && text.back() == '\n') text.pop_back();
  return text;
}

// Empty when the case passed, otherwise why not.
std::string RunCase(const fs::path& folder) {
  const auto method = ReadFile(folder / "method");
  const auto request = ReadFile(folder / "request.json");
  const auto status_text = ReadFile(folder / "expected_status");
  const auto expected = ReadFile(folder / "expected_reply.json");
  if (!method || !request || !status_text || !expected) return "a case file is missing";
  const std::string name = method->substr(0, method->find_first_of("\r\n"));
  const long expected_status = std::strtol(status_text->c_str(), nullptr, 10);

  void* reply = nullptr;
  std::size_t reply_size = 0;
  char* message = nullptr;
  const nucleate_status status = nucleate_call(name.c_str(), request->data(), request->size(),
                                               NUCLEATE_ENCODING_JSON, &reply, &reply_size,
                                               &message);
  const std::unique_ptr<void, void (*)(void*)> reply_owner(reply, nucleate_free);
  const std::unique_ptr<char, void (*)(void*)> message_owner(message, nucleate_free);
  const std::string message_text = message != nullptr ? message : "";
  if (status != expected_status) {
    return "status " + std::to_string(status) + ", expected " + std::to_string(expected_status) +
           " (" + message_text + ")";
  }
  const std::string got =
      reply != nullptr ? std::string(static_cast<const char*>(reply), reply_size) : "";
  if (WithoutFinalNewline(got) != WithoutFinalNewline(*expected)) {
    // Replies are long single lines: show where they part, with context on both sides.
    const std::size_t at = static_cast<std::size_t>(
        std::mismatch(got.begin(), got.begin() + std::min(got.size(), expected->size()),
                      expected->begin())
            .first -
        got.begin());
    const std::size_t from = at > 40 ? at - 40 : 0;
    return "reply differs at byte " + std::to_string(at) + "\n  got:      ..." +
           got.substr(std::min(from, got.size()), 80) + "\n  expected: ..." +
           expected->substr(std::min(from, expected->size()), 80);
  }
  if (status == NUCLEATE_OK && message != nullptr) return "a message on success: " + message_text;
  if (status != NUCLEATE_OK &&
      (message_text.empty() || message_text.find('\n') != std::string::npos)) {
    return "the message is not one non-empty line: " + message_text;
  }
  return "";
}

}  // namespace

int main(int argc, char** argv) {
  if (argc < 2 || argc > 3) {
    std::cerr << "usage: " << argv[0] << " CASES_DIR [EXPECTED_CASE_COUNT]\n";
    return 2;
  }
  std::vector<fs::path> folders;
  std::error_code error;
  for (const fs::directory_entry& entry : fs::directory_iterator(argv[1], error)) {
    if (entry.is_directory()) folders.push_back(entry.path());
  }
  if (error) {
    std::cout << "cannot list the cases in " << argv[1] << ": " << error.message() << '\n';
    return 1;
  }
  std::sort(folders.begin(), folders.end());
  int passed = 0;
  int failed = 0;
  for (const fs::path& folder : folders) {
    const std::string why = RunCase(folder);
    if (why.empty()) {
      ++passed;
    } else {
      ++failed;
      std::cout << "FAIL " << folder.filename().string() << ": " << why << '\n';
    }
  }
  std::cout << passed << " passed, " << failed << " failed\n";
  if (argc == 3 && static_cast<long>(folders.size()) != std::strtol(argv[2], nullptr, 10)) {
    std::cout << "found " << folders.size() << " cases, expected " << argv[2] << '\n';
    return 1;
  }
  return failed == 0 && passed > 0 ? 0 : 1;
}
