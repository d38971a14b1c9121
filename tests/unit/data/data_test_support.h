// A scratch folder per test and small example builders for the data pipeline tests.
#pragma once

#include <cmath>
#include <filesystem>
#include <fstream>
#include <string>
#include <vector>

#include <gtest/gtest.h>
#include <unistd.h>

#include "core/train/data/training_example.h"

namespace nucleate::train::data::testing {

// Removed with everything in it when the test ends; named after the test and the process so
// parallel ctest runs never share one.
class ScratchFolder {
 public:
  ScratchFolder() {
    const ::testing::TestInfo* info = ::testing::UnitTest::GetInstance()->current_test_info();
    path_ = std::filesystem::temp_directory_path() /
            ("nucleate_data_" + std::string(info->test_suite_name()) + "_" + info->name() + "_" +
             std::to_string(::getpid()));
    std::filesystem::remove_all(path_);
    std::filesystem::create_directories(path_);
  }
  ~ScratchFolder() {
    std::error_code ec;
    std::filesystem::remove_all(path_, ec);
  }
  ScratchFolder(const ScratchFolder&) = delete;
  ScratchFolder& operator=(const ScratchFolder&) = delete;

  std::string path() const { return path_.string(); }
  std::string Write(const std::string& name, const std::string& content) const {
    const std::filesystem::path file = path_ / name;
    std::ofstream out(file, std::ios::binary);
    out << content;
    return file.string();
  }

 private:
  std::filesystem::path path_;
};

// An example with a cubic cell of edge `a` and the given species (coordinates spread along the
// body diagonal, which nothing here looks at).
inline TrainingExample CubicExample(const std::string& source, const std::string& formula,
                                    double a, std::vector<int> numbers, int crystal_system,
                                    std::vector<double> properties = {}) {
  TrainingExample e;
  e.source = source;
  e.formula = formula;
  e.crystal.lattice = a * Eigen::Matrix3d::Identity();
  e.crystal.numbers = std::move(numbers);
  for (std::size_t i = 0; i < e.crystal.numbers.size(); ++i) {
    const double t = static_cast<double>(i) / static_cast<double>(e.crystal.numbers.size());
    e.crystal.frac.emplace_back(t, t, t);
  }
  e.crystal.label = source;
  e.crystal_system = crystal_system;
  e.properties = std::move(properties);
  return e;
}

}  // namespace nucleate::train::data::testing
