// Everything a training run needs, as read from its YAML file (train_config.h). Defaults are the
// ones core/model/DESIGN.md argues for; every field is documented in docs/train-config.md.
#pragma once

#include <cstdint>
#include <map>
#include <string>
#include <vector>

#include "core/model/architecture.h"
#include "core/model/diffusion.h"
#include "core/train/data/load_dataset.h"
#include "core/train/loss.h"
#include "core/train/noising.h"
#include "core/train/optim/optimizer.h"

namespace nucleate::train {

struct SplitSettings {
  double validation_fraction = 0.1;  // of compositions, not of structures
  double test_fraction = 0.1;
};

struct OptimisationSettings {
  std::uint32_t seed = 1;
  std::int64_t epochs = 100;
  int batch_size = 64;          // cells per optimiser step
  int micro_batch = 8;          // cells per unit of parallel work: part of the result, unlike threads
  AdamWSettings adamw;
  std::int64_t warmup_steps = 200;
  double final_learning_rate_fraction = 0.05;
  double gradient_clip = 1.0;   // global norm; 0 disables
  double ema_decay = 0.999;
  LossWeights loss_weights;
  ConditionDropout dropout;
  int threads = 0;              // 0: all hardware threads; never changes results
  std::int64_t checkpoint_every_epochs = 1;
};

struct OutputSettings {
  std::string model;       // the bundle written at the end (and on cancellation)
  std::string checkpoint;  // rewritten every checkpoint_every_epochs; empty: none
  bool resume = false;     // continue from `checkpoint` when it exists
};

struct TrainSettings {
  data::DataSource data;
  SplitSettings split;
  model::Architecture architecture;  // elements and properties come from the data
  model::ModelSchedules diffusion = model::DefaultModelSchedules();
  OptimisationSettings optimisation;
  OutputSettings output;
  std::string yaml;  // the configuration text as given, kept in the bundle's provenance
  // Where the configuration gave each data setting, for errors found only when the data are read:
  // DataSource field ("directory") -> "<file>:<line>: <key path>" ("train.yaml:2: data.directory").
  // Empty for settings built in code. Not a setting: it changes no result.
  std::map<std::string, std::string> data_keys;
};

}  // namespace nucleate::train
