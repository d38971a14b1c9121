// A training run's state between epochs, saved so that a resumed run continues bit for bit:
// current weights (inside a complete model file), their moving average, the AdamW moments, the
// counters, and a digest of everything that changes results (schemas/nucleate/v1/checkpoint.proto).
#pragma once

#include <cstdint>
#include <string>
#include <vector>

#include "core/model/bundle/model_bundle.h"
#include "core/train/optim/optimizer.h"

namespace nucleate::train {

inline constexpr char kCheckpointMagic[] = "nucleate-checkpoint";
inline constexpr std::uint32_t kCheckpointFormatVersion = 1;

struct Checkpoint {
  model::ModelBundle model;           // values = current raw weights
  std::vector<float> moving_average;
  AdamWState optimiser;
  std::int64_t epochs_done = 0;
  std::string run_digest;
  std::vector<double> validation_losses;
};

// Atomic write (path.tmp, then rename).
void SaveCheckpoint(const std::string& path, const Checkpoint& checkpoint);

// Errors name the path: not a checkpoint, truncated, corrupted, newer format, and arrays whose
// sizes differ from the model's parameter count.
Checkpoint LoadCheckpoint(const std::string& path);

}  // namespace nucleate::train
