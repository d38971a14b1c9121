#include "core/train/checkpoint.h"

#include "core/common/error.h"
#include "core/common/message_text.h"
#include "core/model/bundle/bundle_file.h"
#include "core/model/bundle/file_io.h"
#include "core/model/bundle/sealed_file.h"
#include "nucleate/v1/checkpoint.pb.h"

namespace nucleate::train {
namespace {

template <typename Repeated>
std::vector<float> ToVector(const Repeated& values) {
  return std::vector<float>(values.begin(), values.end());
}

}  // namespace

void SaveCheckpoint(const std::string& path, const Checkpoint& c) {
  v1::TrainingCheckpoint m;
  m.set_model(model::EncodeModelBundle(c.model));
  *m.mutable_moving_average() = {c.moving_average.begin(), c.moving_average.end()};
  *m.mutable_adam_first() = {c.optimiser.first.begin(), c.optimiser.first.end()};
  *m.mutable_adam_second() = {c.optimiser.second.begin(), c.optimiser.second.end()};
  m.set_optimiser_steps(c.optimiser.step);
  m.set_epochs_done(c.epochs_done);
  m.set_run_digest(c.run_digest);
  *m.mutable_validation_losses() = {c.validation_losses.begin(), c.validation_losses.end()};
  RepairStringFields(&m);
  std::string payload;
  if (!m.SerializeToString(&payload)) throw Internal("could not serialise a training checkpoint");
  model::WriteFileAtomically(path, model::SealFile(kCheckpointMagic, kCheckpointFormatVersion, payload));
}

Checkpoint LoadCheckpoint(const std::string& path) {
  // A checkpoint holds the weights four times (weights, average, two moments): it may use the
  // largest message protobuf parses.
  const std::uint64_t max_bytes = model::BundleLimits::kCeilingMaxFileBytes;
  const std::string bytes = model::ReadFileWithLimit(path, max_bytes);
  const model::UnsealedFile file =
      model::UnsealFile(bytes, kCheckpointMagic, kCheckpointFormatVersion, max_bytes, path);
  v1::TrainingCheckpoint m;
  if (!ParseQuietly(file.payload, &m)) {
    throw InvalidArgument(path, "the checkpoint's content cannot be parsed (damaged file)");
  }
  Checkpoint c;
  c.model = model::DecodeModelBundle(m.model(), path + " (model)");
  const std::size_t size = c.model.values.size();
  if (static_cast<std::size_t>(m.moving_average_size()) != size ||
      static_cast<std::size_t>(m.adam_first_size()) != size ||
      static_cast<std::size_t>(m.adam_second_size()) != size) {
    throw InvalidArgument(path, "optimiser arrays do not match the model's " +
                                    std::to_string(size) + " parameters");
  }
  if (m.optimiser_steps() < 0 || m.epochs_done() < 0) {
    throw InvalidArgument(path, "negative step or epoch count");
  }
  c.moving_average = ToVector(m.moving_average());
  c.optimiser.first = ToVector(m.adam_first());
  c.optimiser.second = ToVector(m.adam_second());
  c.optimiser.step = m.optimiser_steps();
  c.epochs_done = m.epochs_done();
  c.run_digest = m.run_digest();
  c.validation_losses.assign(m.validation_losses().begin(), m.validation_losses().end());
  return c;
}

}  // namespace nucleate::train
