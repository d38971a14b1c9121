#include "core/train/data/dataset_hash.h"

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <cstring>

#include "core/common/error.h"
#include "core/common/sha256.h"

namespace nucleate::train::data {
namespace {

class CanonicalWriter {
 public:
  void Integer(std::uint64_t value) {
    std::uint8_t bytes[8];
    for (int k = 0; k < 8; ++k) bytes[k] = static_cast<std::uint8_t>(value >> (8 * k));
    hasher_.Update(bytes, 8);
  }
  void Signed(std::int64_t value) { Integer(static_cast<std::uint64_t>(value)); }
  void Double(double value) {
    std::uint64_t bits = 0x7ff8000000000000ULL;
    if (!std::isnan(value)) std::memcpy(&bits, &value, sizeof bits);
    Integer(bits);
  }
  void Text(const std::string& text) {
    Integer(text.size());
    hasher_.Update(text);
  }
  void Raw(const std::string& bytes) { hasher_.Update(bytes); }
  std::string HexDigest() { return ToHex(hasher_.Finish()); }

 private:
  Sha256Hasher hasher_;
};

}  // namespace

std::string DatasetHash(const std::vector<TrainingExample>& examples,
                        const std::vector<std::size_t>& train) {
  for (std::size_t k = 0; k < train.size(); ++k) {
    if (train[k] >= examples.size()) {
      throw InvalidArgument("train[" + std::to_string(k) + "]",
                            "index " + std::to_string(train[k]) + " is outside the " +
                                std::to_string(examples.size()) + " examples");
    }
    const structure::Crystal& crystal = examples[train[k]].crystal;
    if (crystal.frac.size() != crystal.numbers.size()) {
      throw InvalidArgument("examples[" + std::to_string(train[k]) + "].crystal.frac",
                            "one coordinate triple per atom needed");
    }
  }
  std::vector<std::size_t> order = train;
  std::sort(order.begin(), order.end(), [&examples](std::size_t a, std::size_t b) {
    const int c = examples[a].source.compare(examples[b].source);
    return c != 0 ? c < 0 : a < b;
  });

  CanonicalWriter out;
  out.Raw(std::string("nucleate-training-data-v1", 25) + '\0');
  out.Integer(order.size());
  for (std::size_t i : order) {
    const TrainingExample& e = examples[i];
    out.Text(e.source);
    out.Text(e.formula);
    out.Signed(e.crystal_system);
    out.Signed(e.space_group);
    out.Integer(e.crystal.size());
    for (int k = 0; k < 9; ++k) out.Double(e.crystal.lattice(k / 3, k % 3));
    for (std::size_t a = 0; a < e.crystal.size(); ++a) {
      out.Signed(e.crystal.numbers[a]);
      for (int k = 0; k < 3; ++k) out.Double(e.crystal.frac[a][k]);
    }
    out.Integer(e.properties.size());
    for (double value : e.properties) out.Double(value);
  }
  return out.HexDigest();
}

}  // namespace nucleate::train::data
