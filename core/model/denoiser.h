// The denoiser network (core/model/DESIGN.md, "The network"): forward pass and hand-written backward
// pass over a GraphBatch. Stateless apart from its architecture and parameter layout: the values
// live in a flat array the caller owns, so one Denoiser serves any number of threads.
#pragma once

#include <vector>

#include "core/model/architecture.h"
#include "core/model/graph_batch.h"
#include "core/model/nn/layers.h"
#include "core/model/nn/parameters.h"

namespace nucleate::model {

template <typename T>
struct DenoiserOutput {
  nn::Matrix<T> coordinate_score;  // atoms x 3: the normalised score, mean-free per cell
  nn::Matrix<T> lattice_noise;     // cells x 6: predicted epsilon of the lattice features
  nn::Matrix<T> species_logits;    // atoms x elements (absorbing mode; empty otherwise)
};

// What the backward pass needs from the forward pass.
template <typename T>
struct DenoiserCache {
  nn::Matrix<T> context_pre, context_hidden, composition_input, property_input;
  struct Layer {
    nn::LayerNormCache<T> norm;
    nn::Matrix<T> x, edge_pre, edge_hidden, message_pre, update_input, update_pre, update_hidden;
  };
  std::vector<Layer> layers;
  nn::LayerNormCache<T> final_norm;
  nn::Matrix<T> final_x;
  nn::Matrix<T> coordinate_pre, coordinate_hidden;
  nn::Matrix<T> pooled, lattice_pre, lattice_hidden;
  nn::Matrix<T> species_pre, species_hidden;
  // Temporaries of both passes. Kept here so that a cache reused across calls allocates only
  // when shapes grow: fresh pages for every product cost more than the arithmetic (measured with
  // bench_denoiser: page faults and zeroing took over half the forward time).
  struct Scratch {
    nn::Matrix<T> context, term, h, send, receive, gathered, messages, mean_message, update;
    nn::Matrix<T> dx, dtmp, dhidden, dfinal, dscore, dpooled, dh, dupdate_hidden, dupdate_pre,
        dupdate_input, dmean, dmessages, dmessage_pre, dedge_hidden, dedge_pre, dnode, dlayer_x,
        dcontext;
  };
  mutable Scratch scratch;
};

class Denoiser {
 public:
  // Validates the architecture (InvalidArgument naming the field) and lays out its parameters.
  explicit Denoiser(const Architecture& architecture);

  const Architecture& architecture() const { return architecture_; }
  const nn::ParameterLayout& layout() const { return layout_; }

  // `cache` may be null when no backward pass follows; passing one anyway (and reusing it across
  // calls) saves the allocations.
  template <typename T>
  void Forward(const GraphBatch<T>& batch, const T* params, DenoiserOutput<T>* out,
               DenoiserCache<T>* cache) const;

  // Accumulates into `grads` (laid out like params) the gradient of a loss whose gradients with
  // respect to the outputs are `d_out` (same shapes as the forward outputs; species_logits may be
  // empty when the loss does not use them).
  template <typename T>
  void Backward(const GraphBatch<T>& batch, const T* params, const DenoiserCache<T>& cache,
                const DenoiserOutput<T>& d_out, T* grads) const;

  // Multiply-adds of one forward pass over `batch` (for the FLOP rate a benchmark reports).
  double ForwardMultiplyAdds(int atoms, int edges, int cells) const;

 private:
  struct LayerParameters {
    nn::LayerNorm norm;
    nn::Linear send, receive, geometry, message, update_in, update_out;
  };

  Architecture architecture_;
  nn::ParameterLayout layout_;
  nn::Embedding species_;
  nn::Linear context_in_, context_out_;
  nn::Linear composition_;      // [fractions, missing] -> hidden
  nn::Embedding crystal_system_;  // row 0 = missing
  nn::Embedding space_group_;     // row 0 = missing
  nn::Linear properties_;       // [values, missing flags] -> hidden
  std::vector<LayerParameters> layers_;
  nn::LayerNorm final_norm_;
  nn::Linear coordinate_hidden_, coordinate_out_;
  nn::Linear lattice_hidden_, lattice_out_;
  nn::Linear species_hidden_, species_out_;
};

}  // namespace nucleate::model
