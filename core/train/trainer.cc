#include "core/train/trainer.h"

#include <chrono>
#include <fstream>
#include <cmath>
#include <iomanip>
#include <limits>
#include <sstream>

#include "core/common/error.h"
#include "core/common/parallel_for.h"
#include "core/common/sha256.h"
#include "core/common/thread_count.h"
#include "core/model/bundle/bundle_file.h"
#include "core/model/denoiser.h"
#include "core/model/diffusion.h"
#include "core/model/nn/parameters.h"
#include "core/random/random_stream.h"
#include "core/train/checkpoint.h"
#include "core/train/data/load_dataset.h"
#include "core/train/loss.h"
#include "core/train/train_config.h"
#include "core/train/training_set.h"

namespace nucleate::train {
namespace {

using Clock = std::chrono::steady_clock;
constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
// Validation noise is drawn at this step counter, never reached by training steps, so every epoch
// scores the same noisy validation cells.
constexpr std::uint32_t kValidationStep = 0xFFFFFFFFu;

// Buffers kept across steps so a step allocates nothing once shapes have settled: one network
// cache per worker thread, one gradient buffer per micro-batch.
struct Workspace {
  std::vector<model::DenoiserCache<float>> caches;       // per worker
  std::vector<model::DenoiserOutput<float>> outputs, gradients;  // per worker
  std::vector<std::vector<float>> micro_gradients;       // per micro-batch
};

// Everything one optimiser step needs, fixed for the run.
struct Run {
  const TrainSettings& settings;
  const TrainingSet& set;
  const model::Denoiser& net;
  const model::DiffusionProcess& process;
  int threads;
  Workspace* workspace;
  const ProcessGroup& group;
};

// This process's micro-batches [first, last) of `count`: a contiguous block, so each process
// sums its own in order and the group adds the blocks' sums.
struct Share {
  std::size_t first, last;
};
Share ShareOf(const ProcessGroup& group, std::size_t count) {
  const auto at = [&](int r) {
    return static_cast<std::size_t>(count * static_cast<std::uint64_t>(r) / group.size);
  };
  return {at(group.rank), at(group.rank + 1)};
}

// Adds `values` (and `extra` behind them) over the group, in double precision, and writes the
// sums back; a one-process group changes nothing, so its results stay bitwise those of Train
// without a group.
void SumOverGroup(const ProcessGroup& group, std::vector<float>* values, double* extra) {
  if (group.size <= 1) return;
  std::vector<double> buffer;
  buffer.reserve((values ? values->size() : 0) + 1);
  if (values) buffer.assign(values->begin(), values->end());
  buffer.push_back(*extra);
  group.sum(&buffer);
  if (values) {
    for (std::size_t i = 0; i < values->size(); ++i) (*values)[i] = static_cast<float>(buffer[i]);
  }
  *extra = buffer.back();
}

// Noised cells -> batch and targets, for cells[begin, end) of `pool`.
struct MicroBatch {
  model::GraphBatch<float> batch;
  BatchTargets<float> targets;
};

MicroBatch Prepare(const Run& run, const std::vector<CleanCell>& pool,
                   const std::vector<std::size_t>& cells, std::size_t begin, std::size_t end,
                   const ConditionDropout& dropout, std::uint32_t step) {
  const OptimisationSettings& o = run.settings.optimisation;
  std::vector<model::NoisyCell> inputs;
  std::vector<NoisedCell> noised;
  for (std::size_t k = begin; k < end; ++k) {
    noised.push_back(NoiseCell(pool[cells[k]], run.process, run.set.statistics.lattice,
                               run.set.architecture, dropout, o.seed,
                               static_cast<std::uint32_t>(cells[k]), step));
    inputs.push_back(noised.back().input);
  }
  MicroBatch m;
  m.batch = model::BuildGraphBatch<float>(run.set.architecture, inputs);
  m.targets = StackTargets(noised);
  return m;
}

void Scale(float factor, model::DenoiserOutput<float>* d) {
  d->coordinate_score *= factor;
  d->lattice_noise *= factor;
  d->species_logits *= factor;
}

std::size_t MicroBatches(std::size_t cells, int micro) { return (cells + micro - 1) / micro; }

// Mean loss of the batch; its gradient into *grad. Micro-batch m covers cells
// [m * micro, (m + 1) * micro): the split depends on settings only, and the micro-batch gradients
// are summed in order, so the thread count never changes a bit.
double BatchGradient(const Run& run, const std::vector<float>& params,
                     const std::vector<std::size_t>& cells, std::uint32_t step,
                     std::vector<float>* grad) {
  const OptimisationSettings& o = run.settings.optimisation;
  const std::size_t count = MicroBatches(cells.size(), o.micro_batch);
  Workspace& ws = *run.workspace;
  std::vector<std::vector<float>>& grads = ws.micro_gradients;
  if (grads.size() < count) grads.resize(count);
  std::vector<double> losses(count, 0.0);
  const Share share_of = ShareOf(run.group, count);
  ParallelFor(share_of.last - share_of.first, run.threads, [&](std::size_t k, int worker) {
    const std::size_t m = share_of.first + k;
    const std::size_t begin = m * o.micro_batch;
    const std::size_t end = std::min(cells.size(), begin + o.micro_batch);
    MicroBatch mb = Prepare(run, run.set.train, cells, begin, end, o.dropout, step);
    model::DenoiserOutput<float>& out = ws.outputs[worker];
    model::DenoiserOutput<float>& d = ws.gradients[worker];
    model::DenoiserCache<float>& cache = ws.caches[worker];
    run.net.Forward<float>(mb.batch, params.data(), &out, &cache);
    const LossParts parts = BatchLoss(mb.batch, out, mb.targets, o.loss_weights, &d);
    const double share = double(end - begin) / double(cells.size());
    Scale(static_cast<float>(share), &d);
    grads[m].assign(params.size(), 0.0f);
    run.net.Backward<float>(mb.batch, params.data(), cache, d, grads[m].data());
    losses[m] = share * parts.total();
  });
  grad->assign(params.size(), 0.0f);
  double loss = 0;
  for (std::size_t m = share_of.first; m < share_of.last; ++m) {
    for (std::size_t i = 0; i < params.size(); ++i) (*grad)[i] += grads[m][i];
    loss += losses[m];
  }
  SumOverGroup(run.group, grad, &loss);
  return loss;
}

// Mean loss over the validation cells at fixed noise, without condition dropout.
double ValidationLoss(const Run& run, const std::vector<float>& params) {
  const std::vector<CleanCell>& pool = run.set.validation;
  if (pool.empty()) return kNaN;
  std::vector<std::size_t> cells(pool.size());
  for (std::size_t i = 0; i < cells.size(); ++i) cells[i] = i;
  const int micro = run.settings.optimisation.micro_batch;
  const std::size_t count = MicroBatches(cells.size(), micro);
  std::vector<double> losses(count, 0.0);
  const ConditionDropout none{0.0, 0.0};
  Workspace& ws = *run.workspace;
  const Share share_of = ShareOf(run.group, count);
  ParallelFor(share_of.last - share_of.first, run.threads, [&](std::size_t k, int worker) {
    const std::size_t m = share_of.first + k;
    const std::size_t begin = m * micro, end = std::min(cells.size(), begin + micro);
    MicroBatch mb = Prepare(run, pool, cells, begin, end, none, kValidationStep);
    model::DenoiserOutput<float>& out = ws.outputs[worker];
    model::DenoiserOutput<float>& d = ws.gradients[worker];
    run.net.Forward<float>(mb.batch, params.data(), &out, &ws.caches[worker]);
    const LossParts parts =
        BatchLoss(mb.batch, out, mb.targets, run.settings.optimisation.loss_weights, &d);
    losses[m] = parts.total() * double(end - begin) / double(cells.size());
  });
  double loss = 0;
  for (double l : losses) loss += l;
  SumOverGroup(run.group, nullptr, &loss);
  return loss;
}

// The epoch's order of training cells: a Fisher-Yates shuffle driven by the epoch's own stream.
std::vector<std::size_t> EpochOrder(std::size_t n, std::uint32_t seed, std::int64_t epoch) {
  std::vector<std::size_t> order(n);
  for (std::size_t i = 0; i < n; ++i) order[i] = i;
  random::RandomStream stream(seed, static_cast<std::uint32_t>(epoch), 0, random::Purpose::kShuffle);
  for (std::size_t i = n; i > 1; --i) {
    const std::size_t j = stream.Below(static_cast<std::uint32_t>(i));
    std::swap(order[i - 1], order[j]);
  }
  return order;
}

// Every setting that changes results, and the data: a checkpoint resumes only the same run.
std::string RunDigest(const TrainSettings& s, const TrainingSet& set, const model::ModelBundle& b) {
  std::ostringstream out;
  out << std::setprecision(17);
  out << "data " << set.dataset_hash << "\n";
  const OptimisationSettings& o = s.optimisation;
  out << "seed " << o.seed << " epochs " << o.epochs << " batch " << o.batch_size << " micro "
      << o.micro_batch << " lr " << o.adamw.learning_rate << " b1 " << o.adamw.beta1 << " b2 "
      << o.adamw.beta2 << " eps " << o.adamw.epsilon << " wd " << o.adamw.weight_decay
      << " warmup " << o.warmup_steps << " final " << o.final_learning_rate_fraction << " clip "
      << o.gradient_clip << " ema " << o.ema_decay << " weights " << o.loss_weights.coordinates
      << " " << o.loss_weights.lattice << " " << o.loss_weights.species << " dropout "
      << o.dropout.each << " " << o.dropout.all << " split " << s.split.validation_fraction << " "
      << s.split.test_fraction << "\n";
  std::string header = out.str();
  // The bundle's architecture and statistics are compared through its encoding with zero weights.
  model::ModelBundle shape = b;
  std::fill(shape.values.begin(), shape.values.end(), 0.0f);
  shape.provenance = {};
  return ToHex(Sha256(header + model::EncodeModelBundle(shape)));
}

model::ModelBundle MakeBundle(const TrainSettings& s, const TrainingSet& set,
                              const model::Denoiser& net, const std::vector<float>& values,
                              std::int64_t steps) {
  model::ModelBundle b;
  b.architecture = set.architecture;
  b.schedules = s.diffusion;
  b.schedules.species.num_classes = set.architecture.species_tokens();
  b.normalisation = set.Normalisation();
  b.atom_counts = set.AtomCounts();
  b.layout = net.layout();
  b.values = values;
  b.provenance.dataset_hash = set.dataset_hash;
  b.provenance.seed = s.optimisation.seed;
  b.provenance.settings = s.yaml;
  b.provenance.library_version = NUCLEATE_LIBRARY_VERSION;
  b.provenance.training_steps = static_cast<std::uint64_t>(steps);
  b.provenance.train_count = set.train.size();
  b.provenance.validation_count = set.validation.size();
  b.provenance.test_count = static_cast<std::uint64_t>(set.test_count);
  return b;
}

std::string Fixed(double x, int digits) {
  std::ostringstream out;
  out << std::fixed << std::setprecision(digits) << x;
  return out.str();
}

}  // namespace

TrainResult Train(const TrainSettings& s, const TrainObserver& observer, const TrainLog& log,
                  const ProcessGroup& group) {
  if (group.size < 1 || group.rank < 0 || group.rank >= group.size) {
    throw InvalidArgument("collective", "process " + std::to_string(group.rank) + " of " +
                                            std::to_string(group.size) + " does not exist");
  }
  if (group.size > 1 && !group.sum) {
    throw InvalidArgument("collective", "a sum over the processes is required");
  }
  const bool writes_files = group.rank == 0;
  const auto say = [&](const std::string& line) {
    if (log) log(line);
  };
  const OptimisationSettings& o = s.optimisation;
  TrainResult result;

  // Errors of the data name the configuration key that pointed at them, with its line.
  data::Dataset dataset;
  try {
    dataset = data::LoadDataset(s.data);
  } catch (const Error& error) {
    throw AtConfigKey(error, s);
  }
  result.data_report = dataset.report;
  say("data: " + std::to_string(dataset.report.structures_kept) + " structures kept, " +
      std::to_string(dataset.report.structures_skipped) + " skipped, " +
      std::to_string(dataset.report.files_skipped) + " files unreadable");
  for (const auto& p : dataset.report.problems) say("data: skipped " + p.source + ": " + p.reason);

  const data::DatasetSplit split = data::SplitByComposition(
      dataset.examples, s.split.validation_fraction, s.split.test_fraction, o.seed);
  const TrainingSet set = BuildTrainingSet(dataset.examples, split, s.architecture);
  dataset.examples.clear();
  result.train_count = static_cast<std::int64_t>(set.train.size());
  result.validation_count = static_cast<std::int64_t>(set.validation.size());
  result.test_count = set.test_count;
  result.validation_unscorable = set.validation_unscorable;
  result.dataset_hash = set.dataset_hash;
  say("split by composition: " + std::to_string(result.train_count) + " train, " +
      std::to_string(result.validation_count) + " validation (" +
      std::to_string(result.validation_unscorable) + " left out: elements unseen in training), " +
      std::to_string(result.test_count) + " test");

  const model::Denoiser net(set.architecture);
  const model::DiffusionProcess process(s.diffusion, set.architecture);
  const int threads = ResolveThreadCount(o.threads, "training.threads");
  Workspace workspace;
  workspace.caches.resize(threads);
  workspace.outputs.resize(threads);
  workspace.gradients.resize(threads);
  const Run run{s, set, net, process, threads, &workspace, group};
  result.parameters = static_cast<std::int64_t>(net.layout().size());

  std::vector<float> params = model::nn::Initialise<float>(net.layout(), o.seed);
  std::vector<float> average = params;
  AdamWState adam;
  adam.first.assign(params.size(), 0.0f);
  adam.second.assign(params.size(), 0.0f);
  std::int64_t epochs_done = 0;
  const std::string digest = RunDigest(s, set, MakeBundle(s, set, net, params, 0));

  if (s.output.resume && !s.output.checkpoint.empty() && std::ifstream(s.output.checkpoint).good()) {
    Checkpoint c = LoadCheckpoint(s.output.checkpoint);
    if (c.run_digest != digest) {
      throw InvalidArgument(s.output.checkpoint,
                            "this checkpoint belongs to a different run (data or settings that "
                            "change results differ); remove it or set output.resume: false");
    }
    params = std::move(c.model.values);
    average = std::move(c.moving_average);
    adam = std::move(c.optimiser);
    epochs_done = c.epochs_done;
    result.validation_losses = c.validation_losses;
    result.resumed = true;
    say("resumed from " + s.output.checkpoint + " after epoch " + std::to_string(epochs_done));
  }

  const std::int64_t steps_per_epoch =
      static_cast<std::int64_t>(MicroBatches(set.train.size(), o.batch_size));
  const std::int64_t total_steps = steps_per_epoch * o.epochs;
  if (o.warmup_steps > total_steps) {
    throw InvalidArgument("training.warmup_steps",
                          std::to_string(o.warmup_steps) + " exceeds the run's " +
                              std::to_string(total_steps) + " optimiser steps (" +
                              std::to_string(steps_per_epoch) + " per epoch)");
  }
  say("model: " + std::to_string(result.parameters) + " parameters; " +
      std::to_string(steps_per_epoch) + " steps per epoch, " + std::to_string(total_steps) +
      " in all; " + std::to_string(threads) + " threads" +
      (group.size > 1 ? " on each of " + std::to_string(group.size) + " processes" : ""));

  const auto save_checkpoint = [&](std::int64_t epochs) {
    if (s.output.checkpoint.empty() || !writes_files) return;
    Checkpoint c;
    c.model = MakeBundle(s, set, net, params, adam.step);
    c.moving_average = average;
    c.optimiser = adam;
    c.epochs_done = epochs;
    c.run_digest = digest;
    c.validation_losses = result.validation_losses;
    SaveCheckpoint(s.output.checkpoint, c);
  };

  const Clock::time_point start = Clock::now();
  const std::int64_t first_step = adam.step;
  std::vector<float> grad;
  double validation = result.validation_losses.empty() ? kNaN : result.validation_losses.back();
  for (std::int64_t epoch = epochs_done; epoch < o.epochs && !result.cancelled; ++epoch) {
    const std::vector<std::size_t> order = EpochOrder(set.train.size(), o.seed, epoch);
    double epoch_loss = 0;
    std::int64_t epoch_steps = 0;
    for (std::size_t begin = 0; begin < order.size(); begin += o.batch_size) {
      const std::vector<std::size_t> cells(
          order.begin() + begin, order.begin() + std::min(order.size(), begin + o.batch_size));
      const double loss = BatchGradient(run, params, cells, static_cast<std::uint32_t>(adam.step), &grad);
      if (!std::isfinite(loss)) {
        throw Numerical("loss", "not finite at step " + std::to_string(adam.step) +
                                    " (lower training.learning_rate)");
      }
      ClipGradientNorm(&grad, o.gradient_clip);
      const double lr = LearningRateAt(adam.step, o.adamw.learning_rate, o.warmup_steps,
                                       total_steps, o.final_learning_rate_fraction);
      AdamWStep(o.adamw, lr, grad, &params, &adam);
      UpdateMovingAverage(o.ema_decay, params, &average);
      result.last_loss = loss;
      epoch_loss += loss;
      ++epoch_steps;
      if (observer) {
        TrainProgress p;
        p.epoch = epoch + 1;
        p.epochs = o.epochs;
        p.step = adam.step;
        p.total_steps = total_steps;
        p.loss = loss;
        p.validation_loss = validation;
        p.elapsed_seconds = std::chrono::duration<double>(Clock::now() - start).count();
        const double done = static_cast<double>(adam.step - first_step);
        p.remaining_seconds = done > 0 ? p.elapsed_seconds / done * double(total_steps - adam.step) : 0;
        if (!observer(p)) result.cancelled = true;
      }
      // Any process may be told to stop (a signal reaches them all, or only one): all stop
      // after the same step.
      double stop = result.cancelled ? 1.0 : 0.0;
      SumOverGroup(group, nullptr, &stop);
      result.cancelled = stop > 0;
      if (result.cancelled) break;
    }
    if (result.cancelled) {
      say("cancelled at step " + std::to_string(adam.step) + " in epoch " + std::to_string(epoch + 1));
      break;
    }
    validation = ValidationLoss(run, average);
    result.validation_losses.push_back(validation);
    epochs_done = epoch + 1;
    say("epoch " + std::to_string(epochs_done) + "/" + std::to_string(o.epochs) + ": train loss " +
        Fixed(epoch_loss / std::max<std::int64_t>(1, epoch_steps), 5) + ", validation loss " +
        (std::isnan(validation) ? std::string("n/a") : Fixed(validation, 5)));
    if (epochs_done % o.checkpoint_every_epochs == 0 || epochs_done == o.epochs) {
      save_checkpoint(epochs_done);
    }
  }
  // A cancelled run keeps its last complete epoch in the checkpoint (so resume stays exact) and
  // writes the model it has so far.
  result.epochs_done = epochs_done;
  result.steps_done = adam.step;
  if (writes_files) {
    model::SaveModelBundle(s.output.model, MakeBundle(s, set, net, average, adam.step));
    say("model written to " + s.output.model);
  }
  return result;
}

}  // namespace nucleate::train
