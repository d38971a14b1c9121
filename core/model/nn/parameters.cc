#include "core/model/nn/parameters.h"

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <utility>

#include "core/common/error.h"
#include "core/random/random_stream.h"

namespace nucleate::model::nn {

int ParameterLayout::Add(const std::string& name, int rows, int cols, TensorSpec::Init init,
                         double init_scale) {
  if (name.empty()) throw InvalidArgument("name", "a tensor needs a name");
  if (Find(name) >= 0) throw InvalidArgument("name", "'" + name + "' is already in the layout");
  if (rows <= 0) throw InvalidArgument("rows", "'" + name + "' needs rows > 0");
  if (cols <= 0) throw InvalidArgument("cols", "'" + name + "' needs cols > 0");
  if (!std::isfinite(init_scale) || init_scale < 0) {
    throw InvalidArgument("init_scale", "'" + name + "' needs a finite init_scale >= 0");
  }
  TensorSpec spec;
  spec.name = name;
  spec.rows = rows;
  spec.cols = cols;
  spec.offset = size_;
  spec.init = init;
  spec.init_scale = init_scale;
  size_ += spec.size();
  tensors_.push_back(std::move(spec));
  return static_cast<int>(tensors_.size()) - 1;
}

int ParameterLayout::Find(const std::string& name) const {
  // A network has a few hundred tensors at most and lookups happen while it is built, so a scan
  // is cheaper than keeping a second index in step.
  for (std::size_t i = 0; i < tensors_.size(); ++i) {
    if (tensors_[i].name == name) return static_cast<int>(i);
  }
  return -1;
}

template <typename T>
std::vector<T> Initialise(const ParameterLayout& layout, std::uint32_t seed) {
  std::vector<T> values(layout.size());
  for (std::size_t k = 0; k < layout.tensors().size(); ++k) {
    const TensorSpec& spec = layout.tensor(static_cast<int>(k));
    T* first = values.data() + spec.offset;
    switch (spec.init) {
      case TensorSpec::Init::kZero:
        std::fill(first, first + spec.size(), T(0));
        break;
      case TensorSpec::Init::kOne:
        std::fill(first, first + spec.size(), T(1));
        break;
      case TensorSpec::Init::kNormal: {
        // Item indices count down from 2^32 - 1 so they never meet the training cells' indices.
        const auto item = static_cast<std::uint32_t>(0xFFFFFFFFu - k);
        random::RandomStream stream(seed, item, 0, random::Purpose::kInitialise);
        for (std::size_t i = 0; i < spec.size(); ++i) {
          first[i] = static_cast<T>(stream.Normal() * spec.init_scale);
        }
        break;
      }
    }
  }
  return values;
}

template std::vector<float> Initialise<float>(const ParameterLayout&, std::uint32_t);
template std::vector<double> Initialise<double>(const ParameterLayout&, std::uint32_t);

}  // namespace nucleate::model::nn
