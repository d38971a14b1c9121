#include "tests/bench/side_by_side/array_dump.h"

#include <cmath>
#include <cstdio>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <sstream>

#include "core/common/error.h"

namespace nucleate::bench {
namespace {

// The files are defined as little-endian; writing host bytes is right only on such a host.
bool HostIsLittleEndian() {
  const std::uint32_t one = 1;
  unsigned char first = 0;
  std::memcpy(&first, &one, 1);
  return first == 1;
}

Error IoError(const std::string& path, const std::string& what) {
  return Error(ErrorKind::kIo, path, what);
}

}  // namespace

std::string JsonString(const std::string& text) {
  std::string out = "\"";
  for (const char ch : text) {
    const auto c = static_cast<unsigned char>(ch);
    if (c == '"' || c == '\\') {
      out += '\\';
      out += ch;
    } else if (c < 0x20) {
      char escaped[8];
      std::snprintf(escaped, sizeof escaped, "\\u%04x", c);
      out += escaped;
    } else {
      out += ch;
    }
  }
  return out + "\"";
}

std::string JsonNumber(double value) {
  if (!std::isfinite(value)) return "null";
  char text[32];
  std::snprintf(text, sizeof text, "%.17g", value);
  return text;
}

ArrayDump::ArrayDump(std::string directory) : directory_(std::move(directory)) {
  if (!HostIsLittleEndian()) {
    throw Error(ErrorKind::kUnsupported, "dump", "this host is big-endian; the dump format is little-endian");
  }
  std::error_code error;
  std::filesystem::create_directories(directory_, error);
  if (error) throw IoError(directory_, "cannot create the directory: " + error.message());
}

void ArrayDump::AddFloat32(const std::string& group, const std::string& name,
                           const std::vector<int>& shape, const float* values) {
  Add(group, name, "float32", shape, values, sizeof(float));
}
void ArrayDump::AddFloat64(const std::string& group, const std::string& name,
                           const std::vector<int>& shape, const double* values) {
  Add(group, name, "float64", shape, values, sizeof(double));
}
void ArrayDump::AddInt32(const std::string& group, const std::string& name,
                         const std::vector<int>& shape, const std::int32_t* values) {
  Add(group, name, "int32", shape, values, sizeof(std::int32_t));
}

void ArrayDump::Add(const std::string& group, const std::string& name, const char* dtype,
                    const std::vector<int>& shape, const void* values, std::size_t element_bytes) {
  std::size_t count = 1;
  for (int extent : shape) count *= static_cast<std::size_t>(extent);
  const std::string relative = group + "/" + name + ".bin";
  const std::filesystem::path path = std::filesystem::path(directory_) / relative;
  std::error_code error;
  std::filesystem::create_directories(path.parent_path(), error);
  if (error) throw IoError(path.parent_path().string(), "cannot create: " + error.message());
  std::ofstream out(path, std::ios::binary | std::ios::trunc);
  out.write(static_cast<const char*>(values), static_cast<std::streamsize>(count * element_bytes));
  if (!out) throw IoError(path.string(), "cannot write");

  std::ostringstream entry;
  entry << "{\"name\": " << JsonString(name) << ", \"group\": " << JsonString(group)
        << ", \"file\": " << JsonString(relative) << ", \"dtype\": \"" << dtype << "\", \"shape\": [";
  for (std::size_t k = 0; k < shape.size(); ++k) entry << (k ? ", " : "") << shape[k];
  entry << "]}";
  arrays_.push_back(entry.str());
}

void ArrayDump::AddFact(const std::string& key, const std::string& json_value) {
  facts_.push_back(JsonString(key) + ": " + json_value);
}

void ArrayDump::WriteManifest() const {
  const std::string path = (std::filesystem::path(directory_) / "manifest.json").string();
  std::ofstream out(path, std::ios::trunc);
  out << "{\n";
  for (const std::string& fact : facts_) out << "  " << fact << ",\n";
  out << "  \"byte_order\": \"little\",\n  \"arrays\": [\n";
  for (std::size_t k = 0; k < arrays_.size(); ++k) {
    out << "    " << arrays_[k] << (k + 1 < arrays_.size() ? ",\n" : "\n");
  }
  out << "  ]\n}\n";
  if (!out) throw IoError(path, "cannot write");
}

}  // namespace nucleate::bench
