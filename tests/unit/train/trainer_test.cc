// A whole training run on a folder of CIF files: it trains, writes a model that loads, gives the
// same weights for 1 and 2 threads, and a run cancelled after one epoch and resumed from its
// checkpoint ends bit for bit where the uninterrupted run ends. Data-parallel runs (a process
// group, played here by threads) match the one-process run within rounding.
#include <algorithm>
#include <cmath>
#include <condition_variable>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <mutex>
#include <string>
#include <thread>

#include <gtest/gtest.h>

#include "core/common/error.h"
#include "core/model/bundle/bundle_file.h"
#include "core/model/evaluate.h"
#include "core/structure/crystal.h"
#include "core/structure/io/cif_writer.h"
#include "core/train/train_config.h"
#include "core/train/trainer.h"

namespace nucleate::train {
namespace {

namespace fs = std::filesystem;

// Rock salt (Fm-3m) conventional cells. Lattice constants from memory (handbook values, 300 K):
// NaCl 5.64 A, MgO 4.21 A, LiF 4.03 A, KCl 6.29 A.
structure::Crystal RockSalt(int cation, int anion, double a) {
  structure::Crystal c;
  c.lattice = Eigen::Matrix3d::Identity() * a;
  const double f[4][3] = {{0, 0, 0}, {0, 0.5, 0.5}, {0.5, 0, 0.5}, {0.5, 0.5, 0}};
  for (const auto& p : f) {
    c.numbers.push_back(cation);
    c.frac.emplace_back(p[0], p[1], p[2]);
    c.numbers.push_back(anion);
    c.frac.emplace_back(p[0] + 0.5 - (p[0] >= 0.5), p[1], p[2]);
  }
  return c;
}

// A process group played by threads: sum() waits for every member, adds their vectors in rank
// order and hands each the same result, as the MPI driver's Reduce + Bcast does.
class ThreadGroup {
 public:
  explicit ThreadGroup(int size) : size_(size), slots_(size) {}
  ProcessGroup Member(int rank) {
    ProcessGroup g;
    g.rank = rank;
    g.size = size_;
    g.sum = [this, rank](std::vector<double>* values) { Sum(rank, values); };
    return g;
  }

 private:
  void Sum(int rank, std::vector<double>* values) {
    std::unique_lock<std::mutex> lock(mutex_);
    const long long round = round_;
    slots_[rank] = *values;
    if (++arrived_ == size_) {
      total_.assign(values->size(), 0.0);
      for (const auto& slot : slots_) {
        for (std::size_t i = 0; i < slot.size(); ++i) total_[i] += slot[i];
      }
      arrived_ = 0;
      ++round_;
      changed_.notify_all();
    } else {
      changed_.wait(lock, [&] { return round_ != round; });
    }
    *values = total_;
  }
  int size_;
  std::vector<std::vector<double>> slots_;
  std::vector<double> total_;
  int arrived_ = 0;
  long long round_ = 0;
  std::mutex mutex_;
  std::condition_variable changed_;
};

// Largest difference between two weight vectors, relative to the largest weight.
double RelativeDifference(const std::vector<float>& a, const std::vector<float>& b) {
  double diff = 0, scale = 0;
  for (std::size_t i = 0; i < a.size(); ++i) {
    diff = std::max(diff, std::abs(double(a[i]) - double(b[i])));
    scale = std::max(scale, std::abs(double(a[i])));
  }
  return diff / scale;
}

class TrainerTest : public ::testing::Test {
 protected:
  void SetUp() override {
    dir_ = fs::temp_directory_path() /
           ("nucleate_trainer_test_" + std::to_string(::testing::UnitTest::GetInstance()->random_seed()) +
            "_" + ::testing::UnitTest::GetInstance()->current_test_info()->name());
    fs::remove_all(dir_);
    fs::create_directories(dir_ / "structures");
    const struct {
      const char* name;
      int cation, anion;
      double a;
    } salts[] = {{"NaCl", 11, 17, 5.64}, {"MgO", 12, 8, 4.21}, {"LiF", 3, 9, 4.03}, {"KCl", 19, 17, 6.29}};
    for (const auto& s : salts) {
      std::ofstream(dir_ / "structures" / (std::string(s.name) + ".cif"))
          << structure::io::WriteCifP1(RockSalt(s.cation, s.anion, s.a));
    }
    std::ofstream(dir_ / "structures" / "broken.cif") << "data_broken\n_cell_length_a 3\n";
  }
  void TearDown() override { fs::remove_all(dir_); }

  TrainSettings Settings(int threads, bool resume) const {
    const std::string yaml = R"(data:
  directory: structures
split: {validation_fraction: 0.0, test_fraction: 0.0}
model: {hidden: 16, layers: 1, fourier_frequencies: 2, radial_basis: 4, time_embedding: 8}
diffusion: {steps: 50}
training:
  seed: 3
  epochs: 2
  batch_size: 2
  micro_batch: 1
  warmup_steps: 1
  threads: )" + std::to_string(threads) + R"(
output:
  model: model.nucleate
  checkpoint: run.checkpoint
  resume: )" + (resume ? "true" : "false") + "\n";
    return ReadTrainConfig(yaml, dir_.string(), "train.yaml");
  }

  std::vector<float> Weights() const {
    return model::LoadModelBundle((dir_ / "model.nucleate").string()).values;
  }

  fs::path dir_;
};

TEST_F(TrainerTest, TrainsReportsBadFilesAndWritesALoadableModel) {
  const TrainResult r = Train(Settings(1, false));
  EXPECT_EQ(r.train_count, 4);
  EXPECT_EQ(r.data_report.structures_kept, 4);
  ASSERT_FALSE(r.data_report.problems.empty());
  EXPECT_NE(r.data_report.problems[0].source.find("broken.cif"), std::string::npos);
  EXPECT_EQ(r.epochs_done, 2);
  EXPECT_EQ(r.steps_done, 4);  // 4 cells, batches of 2, 2 epochs
  EXPECT_TRUE(std::isfinite(r.last_loss));
  const model::ModelBundle b = model::LoadModelBundle((dir_ / "model.nucleate").string());
  EXPECT_EQ(b.architecture.elements, (std::vector<int>{3, 8, 9, 11, 12, 17, 19}));
  EXPECT_EQ(b.provenance.training_steps, 4u);
  EXPECT_EQ(b.provenance.dataset_hash, r.dataset_hash);
  EXPECT_EQ(b.atom_counts.overall.size(), 9u);  // counts[0..8]; every cell has 8 atoms
  EXPECT_EQ(b.atom_counts.overall[8], 4u);
}

TEST_F(TrainerTest, ThreadCountDoesNotChangeABit) {
  Train(Settings(1, false));
  const std::vector<float> one = Weights();
  Train(Settings(2, false));
  EXPECT_EQ(one, Weights());
}

TEST_F(TrainerTest, ResumeFromCheckpointIsExact) {
  Train(Settings(1, false));
  const std::vector<float> uninterrupted = Weights();
  fs::remove(dir_ / "run.checkpoint");

  // Cancel at the first step of epoch 2: the checkpoint holds epoch 1.
  const TrainResult cut = Train(Settings(1, false), [](const TrainProgress& p) { return p.epoch < 2; });
  EXPECT_TRUE(cut.cancelled);
  EXPECT_EQ(cut.epochs_done, 1);
  const TrainResult resumed = Train(Settings(2, true));
  EXPECT_TRUE(resumed.resumed);
  EXPECT_EQ(resumed.epochs_done, 2);
  EXPECT_EQ(uninterrupted, Weights());
}

TEST_F(TrainerTest, CheckpointOfAnotherRunIsRefused) {
  Train(Settings(1, false));
  TrainSettings other = Settings(1, true);
  other.optimisation.adamw.learning_rate *= 2;
  try {
    Train(other);
    FAIL() << "resumed a different run";
  } catch (const Error& e) {
    EXPECT_NE(std::string(e.what()).find("different run"), std::string::npos) << e.what();
  }
}

TEST_F(TrainerTest, EvaluateOnATrainedModel) {
  Train(Settings(1, false));
  const model::ModelBundle bundle = model::LoadModelBundle((dir_ / "model.nucleate").string());
  model::EvaluationInput in;
  in.cell = RockSalt(11, 17, 5.64);
  in.step = 10;
  const auto out = model::EvaluateModel(bundle, {in, in});
  ASSERT_EQ(out.size(), 2u);
  ASSERT_EQ(out[0].coordinate_score.rows(), 8);
  EXPECT_TRUE(out[0].coordinate_score.allFinite());
  EXPECT_TRUE(out[0].lattice_noise.allFinite());
  EXPECT_EQ(out[0].species_logits.size(), 0);  // composition-given model
  // A common translation carries no information: the score is mean-free per cell.
  EXPECT_LT(out[0].coordinate_score.colwise().sum().cwiseAbs().maxCoeff(),
            1e-5 * std::max(1.0, out[0].coordinate_score.cwiseAbs().maxCoeff()));
  // Cells in one call do not see each other: equal cells, equal predictions.
  EXPECT_EQ(out[0].coordinate_score, out[1].coordinate_score);
  EXPECT_EQ(out[0].lattice_noise, out[1].lattice_noise);

  model::EvaluationInput foreign = in;
  foreign.cell.numbers[3] = 26;  // iron: not in the training vocabulary
  try {
    model::EvaluateModel(bundle, {in, foreign});
    FAIL() << "evaluated an element the model never saw";
  } catch (const Error& e) {
    EXPECT_NE(std::string(e.what()).find("cells[1].structure.atomic_numbers[3]"), std::string::npos)
        << e.what();
  }
  model::EvaluationInput late = in;
  late.step = 51;  // the schedules have 50 steps
  EXPECT_THROW(model::EvaluateModel(bundle, {late}), Error);
}

// Two processes, each its share of every batch (batch 4, micro-batches of 1: two each), against
// one process: the same steps and epochs; weights within 1e-5 of the largest (float sums in
// another order; measured 5.9e-8 here); only process 0 writes the model.
TEST_F(TrainerTest, TwoProcessesMatchOneWithinRounding) {
  TrainSettings settings = Settings(1, false);
  settings.optimisation.batch_size = 4;
  settings.optimisation.epochs = 4;
  settings.output.checkpoint.clear();
  const TrainResult serial = Train(settings);
  const std::vector<float> one = Weights();
  fs::remove(dir_ / "model.nucleate");

  ThreadGroup group(2);
  TrainResult results[2];
  std::thread second([&] { results[1] = Train(settings, nullptr, nullptr, group.Member(1)); });
  results[0] = Train(settings, nullptr, nullptr, group.Member(0));
  second.join();
  ASSERT_TRUE(fs::exists(dir_ / "model.nucleate"));
  const std::vector<float> two = Weights();
  ASSERT_EQ(one.size(), two.size());
  const double difference = RelativeDifference(one, two);
  std::printf("largest weight difference, 2 processes vs 1: %.3g of the largest weight\n",
              difference);
  EXPECT_LT(difference, 1e-5);
  EXPECT_NE(one, two);  // the sums really ran in another order (else the test proves little)
  for (const TrainResult& r : results) {
    EXPECT_EQ(r.steps_done, serial.steps_done);
    EXPECT_NEAR(r.last_loss, serial.last_loss, 1e-5 * std::abs(serial.last_loss));
  }
  EXPECT_EQ(results[0].last_loss, results[1].last_loss);
}

// One process told to stop (process 1 here) stops the group after the same step.
TEST_F(TrainerTest, AStopOnOneProcessStopsAll) {
  TrainSettings settings = Settings(1, false);
  settings.output.checkpoint.clear();
  ThreadGroup group(2);
  TrainResult results[2];
  std::thread second([&] {
    results[1] = Train(settings, [](const TrainProgress& p) { return p.step < 3; }, nullptr,
                       group.Member(1));
  });
  results[0] = Train(settings, nullptr, nullptr, group.Member(0));
  second.join();
  for (const TrainResult& r : results) {
    EXPECT_TRUE(r.cancelled);
    EXPECT_EQ(r.steps_done, 3);
  }
}

TEST_F(TrainerTest, AFailedSumOrABadGroupIsAnError) {
  ProcessGroup failing;
  failing.size = 2;
  failing.sum = [](std::vector<double>*) {
    throw Error(ErrorKind::kCollective, "collective.sum_doubles", "the test's sum fails");
  };
  try {
    Train(Settings(1, false), nullptr, nullptr, failing);
    FAIL() << "trained without its sums";
  } catch (const Error& e) {
    EXPECT_EQ(e.kind(), ErrorKind::kCollective);
  }
  ProcessGroup outside;
  outside.rank = 2;
  outside.size = 2;
  outside.sum = [](std::vector<double>*) {};
  EXPECT_THROW(Train(Settings(1, false), nullptr, nullptr, outside), Error);
}

}  // namespace
}  // namespace nucleate::train
