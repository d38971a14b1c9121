#include "core/train/loss.h"

#include <algorithm>
#include <cmath>

#include "core/common/error.h"

namespace nucleate::train {

template <typename T>
LossParts BatchLoss(const model::GraphBatch<T>& b, const model::DenoiserOutput<T>& out,
                    const BatchTargets<T>& targets, const LossWeights& w,
                    model::DenoiserOutput<T>* d) {
  const int cells = b.cells, atoms = b.atoms();
  if (targets.coordinate_score.rows() != atoms || targets.coordinate_score.cols() != 3) {
    throw InvalidArgument("targets.coordinate_score", "shape differs from the batch's atoms x 3");
  }
  if (targets.lattice_noise.rows() != cells || targets.lattice_noise.cols() != 6) {
    throw InvalidArgument("targets.lattice_noise", "shape differs from the batch's cells x 6");
  }
  const bool species = out.species_logits.size() > 0;
  if (species && static_cast<int>(targets.species.size()) != atoms) {
    throw InvalidArgument("targets.species", "needs one entry per atom");
  }
  LossParts parts;
  const double per_cell = 1.0 / cells;
  d->coordinate_score.setZero(atoms, 3);
  d->lattice_noise.setZero(cells, 6);
  d->species_logits.setZero(out.species_logits.rows(), out.species_logits.cols());
  for (int c = 0; c < cells; ++c) {
    const int begin = b.atom_offsets[c], end = b.atom_offsets[c + 1];
    const double scale = per_cell * w.coordinates / (3.0 * (end - begin));
    for (int i = begin; i < end; ++i) {
      for (int k = 0; k < 3; ++k) {
        const double r = double(out.coordinate_score(i, k)) - double(targets.coordinate_score(i, k));
        parts.coordinates += scale * r * r;
        d->coordinate_score(i, k) = static_cast<T>(2 * scale * r);
      }
    }
    const double lattice_scale = per_cell * w.lattice / 6.0;
    for (int k = 0; k < 6; ++k) {
      const double r = double(out.lattice_noise(c, k)) - double(targets.lattice_noise(c, k));
      parts.lattice += lattice_scale * r * r;
      d->lattice_noise(c, k) = static_cast<T>(2 * lattice_scale * r);
    }
    if (!species) continue;
    int masked = 0;
    for (int i = begin; i < end; ++i) masked += targets.species[i] >= 0;
    if (masked == 0) continue;
    const double species_scale = per_cell * w.species / masked;
    const int classes = static_cast<int>(out.species_logits.cols());
    for (int i = begin; i < end; ++i) {
      const int target = targets.species[i];
      if (target < 0) continue;
      if (target >= classes) throw InvalidArgument("targets.species", "index beyond the vocabulary");
      // Softmax cross-entropy, shifted by the largest logit so exp never overflows.
      double top = out.species_logits(i, 0);
      for (int k = 1; k < classes; ++k) top = std::max(top, double(out.species_logits(i, k)));
      double sum = 0;
      for (int k = 0; k < classes; ++k) sum += std::exp(double(out.species_logits(i, k)) - top);
      const double log_sum = std::log(sum) + top;
      parts.species += species_scale * (log_sum - double(out.species_logits(i, target)));
      for (int k = 0; k < classes; ++k) {
        const double p = std::exp(double(out.species_logits(i, k)) - log_sum);
        d->species_logits(i, k) = static_cast<T>(species_scale * (p - (k == target ? 1 : 0)));
      }
    }
  }
  return parts;
}

template LossParts BatchLoss<float>(const model::GraphBatch<float>&,
                                    const model::DenoiserOutput<float>&,
                                    const BatchTargets<float>&, const LossWeights&,
                                    model::DenoiserOutput<float>*);
template LossParts BatchLoss<double>(const model::GraphBatch<double>&,
                                     const model::DenoiserOutput<double>&,
                                     const BatchTargets<double>&, const LossWeights&,
                                     model::DenoiserOutput<double>*);

}  // namespace nucleate::train
