#include "tests/bench/side_by_side/side_by_side_network.h"

#include <algorithm>

#include "core/common/parallel_for.h"

namespace nucleate::bench {

SideBySideNetwork::SideBySideNetwork(const model::ModelBundle& bundle, const SideBySideBatch& batch,
                                     int threads)
    : bundle_(bundle),
      batch_(batch),
      threads_(std::max(threads, 1)),
      net_(bundle.architecture),
      caches_(threads_),
      output_gradients_(threads_),
      outputs_(batch.micro.size()),
      micro_gradients_(batch.micro.size()),
      micro_losses_(batch.micro.size()) {}

void SideBySideNetwork::Forward() {
  ParallelFor(batch_.micro.size(), threads_, [&](std::size_t m, int worker) {
    net_.Forward<float>(batch_.micro[m], bundle_.values.data(), &outputs_[m], &caches_[worker]);
  });
}

train::LossParts SideBySideNetwork::Gradient() {
  const std::size_t count = batch_.micro.size();
  ParallelFor(count, threads_, [&](std::size_t m, int worker) {
    const model::GraphBatch<float>& b = batch_.micro[m];
    model::DenoiserOutput<float>& d = output_gradients_[worker];
    net_.Forward<float>(b, bundle_.values.data(), &outputs_[m], &caches_[worker]);
    // Default loss weights (1, 1, 1), as the demo model was trained.
    micro_losses_[m] = train::BatchLoss(b, outputs_[m], batch_.micro_targets[m], {}, &d);
    // Each micro-batch's loss is a mean over its cells; the batch loss is the mean over all cells.
    const float share = static_cast<float>(double(b.cells) / kBatchCells);
    d.coordinate_score *= share;
    d.lattice_noise *= share;
    d.species_logits *= share;
    micro_gradients_[m].assign(bundle_.values.size(), 0.0f);
    net_.Backward<float>(b, bundle_.values.data(), caches_[worker], d, micro_gradients_[m].data());
  });
  gradient_.assign(bundle_.values.size(), 0.0f);
  train::LossParts loss;
  for (std::size_t m = 0; m < count; ++m) {
    for (std::size_t i = 0; i < gradient_.size(); ++i) gradient_[i] += micro_gradients_[m][i];
    const double share = double(batch_.micro[m].cells) / kBatchCells;
    loss.coordinates += share * micro_losses_[m].coordinates;
    loss.lattice += share * micro_losses_[m].lattice;
    loss.species += share * micro_losses_[m].species;
  }
  return loss;
}

}  // namespace nucleate::bench
