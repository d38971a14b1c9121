// A whole training run (core/model/DESIGN.md): read the data, split it by composition, build the
// vocabulary and statistics, then AdamW over shuffled batches with warm-up and cosine decay,
// gradient clipping and a moving average of the weights; a validation loss per epoch; checkpoints
// and exact resume; progress and cancellation. Results are bitwise the same for any thread count.
#pragma once

#include <cstdint>
#include <functional>
#include <string>
#include <vector>

#include "core/train/data/training_example.h"
#include "core/train/train_settings.h"

namespace nucleate::train {

struct TrainProgress {
  std::int64_t epoch = 0, epochs = 0;     // epoch in progress (1-based)
  std::int64_t step = 0, total_steps = 0;  // optimiser steps done / planned
  double loss = 0;                         // mean training loss of the last step
  double validation_loss = 0;              // of the last finished epoch; NaN before the first
  double elapsed_seconds = 0;
  double remaining_seconds = 0;            // estimate from this run's pace
};
// Called after every optimiser step; returning false cancels: the run stops after that step,
// saves a checkpoint (when one is configured) and the model, and returns with cancelled = true.
using TrainObserver = std::function<bool(const TrainProgress&)>;
// One line per event worth a log file: data read, split sizes, each epoch's losses, files written.
using TrainLog = std::function<void(const std::string&)>;

struct TrainResult {
  data::DatasetReport data_report;
  std::int64_t train_count = 0, validation_count = 0, test_count = 0;
  std::int64_t validation_unscorable = 0;
  std::int64_t epochs_done = 0, steps_done = 0;
  std::vector<double> validation_losses;  // per epoch done (NaN without validation cells)
  double last_loss = 0;
  bool resumed = false;
  bool cancelled = false;
  std::int64_t parameters = 0;
  std::string dataset_hash;
};

// The processes of a data-parallel run (nucleate_call_collective; the MPI driver). Every process
// runs Train with the same settings and data. Process r computes micro-batches
// [count * r / size, count * (r + 1) / size) of every batch and of the validation set, and `sum`
// adds a vector over all processes in place, the same bits on each, so every process takes the
// same optimiser step. Only process 0 writes the checkpoint and the model. Results equal the
// one-process run up to the rounding of the changed summation order (core/model/DESIGN.md,
// "Across processes").
struct ProcessGroup {
  int rank = 0;
  int size = 1;
  std::function<void(std::vector<double>* values)> sum;  // required when size > 1; throws on failure
};

TrainResult Train(const TrainSettings& settings, const TrainObserver& observer = nullptr,
                  const TrainLog& log = nullptr, const ProcessGroup& group = {});

}  // namespace nucleate::train
