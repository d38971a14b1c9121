#include "core/model/denoiser.h"

#include <string>

namespace nucleate::model {
namespace {

using nn::Matrix;

// *out = [left, right] side by side, reusing out's storage.
template <typename T>
void Concatenate(const Matrix<T>& left, const Matrix<T>& right, Matrix<T>* out) {
  out->resize(left.rows(), left.cols() + right.cols());
  out->leftCols(left.cols()) = left;
  out->rightCols(right.cols()) = right;
}

// *out = [values, 1 - present]: a missing entry contributes its own learned row instead of a value.
template <typename T>
void WithMissingFlags(const Matrix<T>& values, const Matrix<T>& present, Matrix<T>* out) {
  out->resize(values.rows(), values.cols() + present.cols());
  out->leftCols(values.cols()) = values;
  out->rightCols(present.cols()).array() = T(1) - present.array();
}

}  // namespace

Denoiser::Denoiser(const Architecture& architecture) : architecture_(architecture) {
  ValidateArchitecture(architecture_);
  const Architecture& a = architecture_;
  const int h = a.hidden;
  const int elements = static_cast<int>(a.elements.size());
  species_ = nn::AddEmbedding(&layout_, "species", a.species_tokens(), h);
  context_in_ = nn::AddLinear(&layout_, "context.in", a.time_embedding + 6, h);
  context_out_ = nn::AddLinear(&layout_, "context.out", h, h);
  if (a.condition_composition) {
    composition_ = nn::AddLinear(&layout_, "condition.composition", elements + 1, h);
  }
  if (a.condition_crystal_system) {
    crystal_system_ = nn::AddEmbedding(&layout_, "condition.crystal_system", 8, h);
  }
  if (a.condition_space_group) {
    space_group_ = nn::AddEmbedding(&layout_, "condition.space_group", 231, h);
  }
  if (!a.properties.empty()) {
    properties_ = nn::AddLinear(&layout_, "condition.properties",
                                2 * static_cast<int>(a.properties.size()), h);
  }
  for (int l = 0; l < a.layers; ++l) {
    const std::string p = "layer" + std::to_string(l) + ".";
    LayerParameters lp;
    lp.norm = nn::AddLayerNorm(&layout_, p + "norm", h);
    lp.send = nn::AddLinear(&layout_, p + "send", h, h);
    lp.receive = nn::AddLinear(&layout_, p + "receive", h, h);
    lp.geometry = nn::AddLinear(&layout_, p + "geometry", a.edge_features(), h);
    lp.message = nn::AddLinear(&layout_, p + "message", h, h);
    lp.update_in = nn::AddLinear(&layout_, p + "update_in", 2 * h, h);
    lp.update_out = nn::AddLinear(&layout_, p + "update_out", h, h);
    layers_.push_back(lp);
  }
  final_norm_ = nn::AddLayerNorm(&layout_, "final_norm", h);
  coordinate_hidden_ = nn::AddLinear(&layout_, "head.coordinate.hidden", h, h);
  coordinate_out_ = nn::AddLinear(&layout_, "head.coordinate.out", h, 3);
  lattice_hidden_ = nn::AddLinear(&layout_, "head.lattice.hidden", h, h);
  lattice_out_ = nn::AddLinear(&layout_, "head.lattice.out", h, 6);
  if (a.species_mode == SpeciesMode::kAbsorbing) {
    species_hidden_ = nn::AddLinear(&layout_, "head.species.hidden", h, h);
    species_out_ = nn::AddLinear(&layout_, "head.species.out", h, elements);
  }
}

template <typename T>
void Denoiser::Forward(const GraphBatch<T>& b, const T* w, DenoiserOutput<T>* out,
                       DenoiserCache<T>* cache) const {
  const Architecture& a = architecture_;
  DenoiserCache<T> local;
  DenoiserCache<T>& c = cache ? *cache : local;
  c.layers.resize(layers_.size());

  // Per-cell context: time, noisy lattice and conditions, added to every atom of the cell.
  auto& s = c.scratch;
  nn::LinearForward(context_in_, w, b.cell_inputs, &c.context_pre);
  nn::SiluForward(c.context_pre, &c.context_hidden);
  nn::LinearForward(context_out_, w, c.context_hidden, &s.context);
  if (a.condition_composition) {
    WithMissingFlags(b.composition, b.composition_present, &c.composition_input);
    nn::LinearForward(composition_, w, c.composition_input, &s.term);
    s.context += s.term;
  }
  if (a.condition_crystal_system) {
    nn::EmbeddingForward(crystal_system_, w, b.crystal_system, &s.term);
    s.context += s.term;
  }
  if (a.condition_space_group) {
    nn::EmbeddingForward(space_group_, w, b.space_group, &s.term);
    s.context += s.term;
  }
  if (!a.properties.empty()) {
    WithMissingFlags(b.properties, b.properties_present, &c.property_input);
    nn::LinearForward(properties_, w, c.property_input, &s.term);
    s.context += s.term;
  }
  nn::EmbeddingForward(species_, w, b.tokens, &s.h);
  nn::SegmentBroadcast(s.context, b.atom_offsets, &s.term);
  s.h += s.term;

  for (std::size_t l = 0; l < layers_.size(); ++l) {
    const LayerParameters& p = layers_[l];
    typename DenoiserCache<T>::Layer& k = c.layers[l];
    nn::LayerNormForward(p.norm, w, s.h, &k.x, &k.norm);
    nn::LinearForward(p.send, w, k.x, &s.send);
    nn::LinearForward(p.receive, w, k.x, &s.receive);
    nn::LinearForward(p.geometry, w, b.edge_geometry, &k.edge_pre);
    nn::GatherRows(s.send, b.edge_sender, &s.gathered);
    k.edge_pre += s.gathered;
    nn::GatherRows(s.receive, b.edge_receiver, &s.gathered);
    k.edge_pre += s.gathered;
    nn::SiluForward(k.edge_pre, &k.edge_hidden);
    nn::LinearForward(p.message, w, k.edge_hidden, &k.message_pre);
    nn::SiluForward(k.message_pre, &s.messages);
    nn::SegmentMean(s.messages, b.edge_offsets, &s.mean_message);
    Concatenate(k.x, s.mean_message, &k.update_input);
    nn::LinearForward(p.update_in, w, k.update_input, &k.update_pre);
    nn::SiluForward(k.update_pre, &k.update_hidden);
    nn::LinearForward(p.update_out, w, k.update_hidden, &s.update);
    s.h += s.update;
  }

  nn::LayerNormForward(final_norm_, w, s.h, &c.final_x, &c.final_norm);
  nn::LinearForward(coordinate_hidden_, w, c.final_x, &c.coordinate_pre);
  nn::SiluForward(c.coordinate_pre, &c.coordinate_hidden);
  nn::LinearForward(coordinate_out_, w, c.coordinate_hidden, &out->coordinate_score);
  nn::RemoveSegmentMean(b.atom_offsets, &out->coordinate_score);

  nn::SegmentMean(c.final_x, b.atom_offsets, &c.pooled);
  nn::LinearForward(lattice_hidden_, w, c.pooled, &c.lattice_pre);
  nn::SiluForward(c.lattice_pre, &c.lattice_hidden);
  nn::LinearForward(lattice_out_, w, c.lattice_hidden, &out->lattice_noise);

  if (a.species_mode == SpeciesMode::kAbsorbing) {
    nn::LinearForward(species_hidden_, w, c.final_x, &c.species_pre);
    nn::SiluForward(c.species_pre, &c.species_hidden);
    nn::LinearForward(species_out_, w, c.species_hidden, &out->species_logits);
  } else {
    out->species_logits.resize(0, 0);
  }
}

template <typename T>
void Denoiser::Backward(const GraphBatch<T>& b, const T* w, const DenoiserCache<T>& c,
                        const DenoiserOutput<T>& d, T* g) const {
  const Architecture& a = architecture_;
  const int hidden = a.hidden;
  auto& s = c.scratch;

  // Heads. The mean removal is a self-adjoint projection: its backward pass is the same.
  s.dscore = d.coordinate_score;
  nn::RemoveSegmentMean(b.atom_offsets, &s.dscore);
  nn::LinearBackward(coordinate_out_, w, c.coordinate_hidden, s.dscore, g, &s.dhidden);
  nn::SiluBackward(c.coordinate_pre, s.dhidden, &s.dtmp);
  nn::LinearBackward(coordinate_hidden_, w, c.final_x, s.dtmp, g, &s.dfinal);

  nn::LinearBackward(lattice_out_, w, c.lattice_hidden, d.lattice_noise, g, &s.dhidden);
  nn::SiluBackward(c.lattice_pre, s.dhidden, &s.dtmp);
  nn::LinearBackward(lattice_hidden_, w, c.pooled, s.dtmp, g, &s.dpooled);
  nn::SegmentMeanBackward(s.dpooled, b.atom_offsets, &s.dx);
  s.dfinal += s.dx;

  if (a.species_mode == SpeciesMode::kAbsorbing && d.species_logits.size() > 0) {
    nn::LinearBackward(species_out_, w, c.species_hidden, d.species_logits, g, &s.dhidden);
    nn::SiluBackward(c.species_pre, s.dhidden, &s.dtmp);
    nn::LinearBackward(species_hidden_, w, c.final_x, s.dtmp, g, &s.dx);
    s.dfinal += s.dx;
  }

  nn::LayerNormBackward(final_norm_, w, c.final_norm, s.dfinal, g, &s.dh);

  for (std::size_t l = layers_.size(); l-- > 0;) {
    const LayerParameters& p = layers_[l];
    const typename DenoiserCache<T>::Layer& k = c.layers[l];
    // h_out = h_in + update: s.dh flows to h_in unchanged, plus through the branch.
    nn::LinearBackward(p.update_out, w, k.update_hidden, s.dh, g, &s.dupdate_hidden);
    nn::SiluBackward(k.update_pre, s.dupdate_hidden, &s.dupdate_pre);
    nn::LinearBackward(p.update_in, w, k.update_input, s.dupdate_pre, g, &s.dupdate_input);
    s.dlayer_x = s.dupdate_input.leftCols(hidden);
    s.dmean = s.dupdate_input.rightCols(hidden);
    nn::SegmentMeanBackward(s.dmean, b.edge_offsets, &s.dmessages);
    nn::SiluBackward(k.message_pre, s.dmessages, &s.dmessage_pre);
    nn::LinearBackward(p.message, w, k.edge_hidden, s.dmessage_pre, g, &s.dedge_hidden);
    nn::SiluBackward(k.edge_pre, s.dedge_hidden, &s.dedge_pre);
    nn::LinearBackward<T>(p.geometry, w, b.edge_geometry, s.dedge_pre, g, nullptr);
    const int atoms = b.atoms();
    nn::GatherRowsBackward(s.dedge_pre, b.edge_sender, atoms, &s.dnode);
    nn::LinearBackward(p.send, w, k.x, s.dnode, g, &s.dx);
    s.dlayer_x += s.dx;
    nn::GatherRowsBackward(s.dedge_pre, b.edge_receiver, atoms, &s.dnode);
    nn::LinearBackward(p.receive, w, k.x, s.dnode, g, &s.dx);
    s.dlayer_x += s.dx;
    nn::LayerNormBackward(p.norm, w, k.norm, s.dlayer_x, g, &s.dx);
    s.dh += s.dx;
  }

  nn::EmbeddingBackward(species_, b.tokens, s.dh, g);
  nn::SegmentBroadcastBackward(s.dh, b.atom_offsets, &s.dcontext);
  if (a.condition_composition) {
    nn::LinearBackward<T>(composition_, w, c.composition_input, s.dcontext, g, nullptr);
  }
  if (a.condition_crystal_system) nn::EmbeddingBackward(crystal_system_, b.crystal_system, s.dcontext, g);
  if (a.condition_space_group) nn::EmbeddingBackward(space_group_, b.space_group, s.dcontext, g);
  if (!a.properties.empty()) {
    nn::LinearBackward<T>(properties_, w, c.property_input, s.dcontext, g, nullptr);
  }
  nn::LinearBackward(context_out_, w, c.context_hidden, s.dcontext, g, &s.dhidden);
  nn::SiluBackward(c.context_pre, s.dhidden, &s.dtmp);
  nn::LinearBackward<T>(context_in_, w, b.cell_inputs, s.dtmp, g, nullptr);
}

double Denoiser::ForwardMultiplyAdds(int atoms, int edges, int cells) const {
  const Architecture& a = architecture_;
  const double h = a.hidden;
  double per_layer = edges * (a.edge_features() * h + h * h)  // geometry and message products
                     + atoms * (2 * h * h + 2 * h * h + h * h);  // send, receive, update in, out
  double heads = atoms * (h * h + 3 * h) + cells * (h * h + 6 * h);
  if (a.species_mode == SpeciesMode::kAbsorbing) heads += atoms * (h * h + h * a.elements.size());
  const double context = cells * ((a.time_embedding + 6) * h + h * h);
  return a.layers * per_layer + heads + context;
}

template void Denoiser::Forward<float>(const GraphBatch<float>&, const float*,
                                       DenoiserOutput<float>*, DenoiserCache<float>*) const;
template void Denoiser::Forward<double>(const GraphBatch<double>&, const double*,
                                        DenoiserOutput<double>*, DenoiserCache<double>*) const;
template void Denoiser::Backward<float>(const GraphBatch<float>&, const float*,
                                        const DenoiserCache<float>&, const DenoiserOutput<float>&,
                                        float*) const;
template void Denoiser::Backward<double>(const GraphBatch<double>&, const double*,
                                         const DenoiserCache<double>&,
                                         const DenoiserOutput<double>&, double*) const;

}  // namespace nucleate::model
