#include "structure_files.h"

#include <fstream>
#include <iostream>
#include <iterator>
#include <stdexcept>

#include "json_reply.h"

namespace nucleate::cli {

std::string FileInputJson(const std::string& path) {
  std::ifstream file(path, std::ios::binary);
  if (!file) throw std::runtime_error(path + ": cannot read the file");
  const std::string content{std::istreambuf_iterator<char>(file),
                            std::istreambuf_iterator<char>()};
  return "{\"file\":{\"name\":" + JsonQuote(path) + ",\"content\":\"" + Base64(content) + "\"}}";
}

std::string FileInputsJson(const std::vector<std::string>& paths, int* unreadable) {
  std::string inputs;
  for (const std::string& path : paths) {
    try {
      inputs += (inputs.empty() ? "" : ",") + FileInputJson(path);
    } catch (const std::runtime_error& error) {
      std::cerr << "nucleate: " << error.what() << '\n';
      ++*unreadable;
    }
  }
  return "[" + inputs + "]";
}

}  // namespace nucleate::cli
