#include "tests/unit/assess/assess_fixture.h"

#include <algorithm>
#include <filesystem>
#include <fstream>

#include "core/model/bundle/bundle_file.h"
#include "core/structure/io/cif_writer.h"
#include "core/train/train_config.h"
#include "core/train/trainer.h"
#include "tests/unit/bundle/bundle_fixture.h"

namespace nucleate::assess::testing {

namespace fs = std::filesystem;

structure::Crystal RockSalt(int a_number, int b_number, double a) {
  structure::Crystal c;
  const double h = a / 2;
  c.lattice << 0, h, h, h, 0, h, h, h, 0;
  c.numbers = {a_number, b_number};
  c.frac = {Eigen::Vector3d(0, 0, 0), Eigen::Vector3d(0.5, 0.5, 0.5)};
  return c;
}

structure::Crystal CesiumChlorideType(int a_number, int b_number, double a) {
  structure::Crystal c;
  c.lattice = Eigen::Matrix3d::Identity() * a;
  c.numbers = {a_number, b_number};
  c.frac = {Eigen::Vector3d(0, 0, 0), Eigen::Vector3d(0.5, 0.5, 0.5)};
  return c;
}

std::vector<structure::Crystal> IonicCells() {
  std::vector<structure::Crystal> cells = {RockSalt(11, 17, 5.64),
                                           RockSalt(19, 17, 6.29),
                                           RockSalt(3, 9, 4.03),
                                           RockSalt(12, 8, 4.21),
                                           CesiumChlorideType(55, 17, 4.12),
                                           CesiumChlorideType(55, 35, 4.29),
                                           CesiumChlorideType(81, 17, 3.84)};
  const char* labels[] = {"NaCl", "KCl", "LiF", "MgO", "CsCl", "CsBr", "TlCl"};
  for (std::size_t k = 0; k < cells.size(); ++k) cells[k].label = labels[k];
  return cells;
}

model::ModelBundle TrainOn(const std::string& dir, const std::vector<structure::Crystal>& cells,
                           const std::string& yaml) {
  fs::create_directories(fs::path(dir) / "structures");
  for (const structure::Crystal& c : cells) {
    std::ofstream(fs::path(dir) / "structures" / (c.label + ".cif"))
        << structure::io::WriteCifP1(c);
  }
  train::Train(train::ReadTrainConfig(yaml, dir, "assess.yaml"));
  return model::LoadModelBundle((fs::path(dir) / "model.nucleate").string());
}

model::ModelBundle TrainIonicModel(int epochs, const std::string& species) {
  const model::testing::TemporaryDirectory temporary;
  return TrainOn(temporary.path(), IonicCells(),
                 R"(data: {directory: structures}
split: {validation_fraction: 0.0, test_fraction: 0.0}
model: {hidden: 32, layers: 2, time_embedding: 16, species: )" +
                     species + R"(}
diffusion: {steps: 100}
training:
  epochs: )" + std::to_string(epochs) +
                     R"(
  batch_size: 7
  micro_batch: 1
  learning_rate: 0.003
  warmup_steps: )" + std::to_string(std::min(50, epochs)) +
                     R"(
  ema_decay: 0.99
  condition_dropout: 0.0
  all_conditions_dropout: 0.0
output: {model: model.nucleate}
)");
}

}  // namespace nucleate::assess::testing
