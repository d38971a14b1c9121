// A directory of raw arrays and a JSON manifest describing them, for another program (the PyTorch
// side of the benchmark) to read with numpy.fromfile. Each array is one file
// DIR/<group>/<name>.bin of little-endian values, row-major; the manifest DIR/manifest.json lists
// name, group, file, dtype ("float32", "float64", "int32") and shape, plus scalar facts.
#pragma once

#include <cstdint>
#include <string>
#include <vector>

namespace nucleate::bench {

class ArrayDump {
 public:
  // Creates DIR and its group folders as arrays arrive. Errors (kIo) name the path.
  explicit ArrayDump(std::string directory);

  void AddFloat32(const std::string& group, const std::string& name, const std::vector<int>& shape,
                  const float* values);
  void AddFloat64(const std::string& group, const std::string& name, const std::vector<int>& shape,
                  const double* values);
  void AddInt32(const std::string& group, const std::string& name, const std::vector<int>& shape,
                const std::int32_t* values);

  // A manifest entry "key": value, the value already JSON (a number, an object, a list).
  void AddFact(const std::string& key, const std::string& json_value);

  // Writes DIR/manifest.json.
  void WriteManifest() const;

 private:
  void Add(const std::string& group, const std::string& name, const char* dtype,
           const std::vector<int>& shape, const void* values, std::size_t element_bytes);

  std::string directory_;
  std::vector<std::string> arrays_;  // JSON objects
  std::vector<std::string> facts_;   // "key": value
};

// JSON text of a string (quotes and escapes added) and of a double (17 significant digits, so the
// value reads back exactly; NaN and infinities, which JSON lacks, as null).
std::string JsonString(const std::string& text);
std::string JsonNumber(double value);

}  // namespace nucleate::bench
