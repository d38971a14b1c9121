#include "tests/bench/side_by_side/side_by_side_dump.h"

#include <cstdint>
#include <sstream>

#include "core/model/diffusion.h"
#include "tests/bench/side_by_side/array_dump.h"

namespace nucleate::bench {
namespace {

using model::nn::Matrix;
static_assert(sizeof(int) == sizeof(std::int32_t), "index arrays are written as int32");

int Rows(const Matrix<float>& m) { return static_cast<int>(m.rows()); }
int Cols(const Matrix<float>& m) { return static_cast<int>(m.cols()); }

void AddMatrix(ArrayDump* dump, const std::string& group, const std::string& name,
               const Matrix<float>& m) {
  dump->AddFloat32(group, name, {Rows(m), Cols(m)}, m.data());
}
void AddIndices(ArrayDump* dump, const std::string& group, const std::string& name,
                const std::vector<int>& v) {
  dump->AddInt32(group, name, {static_cast<int>(v.size())}, v.data());
}

// The rows of every micro-batch's `part` stacked in cell order (micro-batches cover consecutive
// cells, so this is the whole batch's matrix).
Matrix<float> Stack(const std::vector<model::DenoiserOutput<float>>& outputs,
                    Matrix<float> model::DenoiserOutput<float>::*part) {
  Eigen::Index rows = 0;
  for (const auto& o : outputs) rows += (o.*part).rows();
  Matrix<float> out(rows, outputs.empty() ? 0 : (outputs.front().*part).cols());
  Eigen::Index at = 0;
  for (const auto& o : outputs) {
    out.middleRows(at, (o.*part).rows()) = o.*part;
    at += (o.*part).rows();
  }
  return out;
}

template <typename Items, typename Format>
std::string JsonList(const Items& items, Format format) {
  std::ostringstream out;
  out << "[";
  bool first = true;
  for (const auto& item : items) {
    out << (first ? "" : ", ") << format(item);
    first = false;
  }
  out << "]";
  return out.str();
}

std::string ArchitectureJson(const model::Architecture& a) {
  std::ostringstream out;
  const auto flag = [](bool b) { return b ? "true" : "false"; };
  out << "{\"hidden\": " << a.hidden << ", \"layers\": " << a.layers
      << ", \"fourier_frequencies\": " << a.fourier_frequencies
      << ", \"radial_basis\": " << a.radial_basis << ", \"radial_max\": " << JsonNumber(a.radial_max)
      << ", \"time_embedding\": " << a.time_embedding
      << ", \"cutoff_from_atoms\": " << a.cutoff_from_atoms << ", \"cutoff\": " << JsonNumber(a.cutoff)
      << ", \"species_mode\": \""
      << (a.species_mode == model::SpeciesMode::kAbsorbing ? "absorbing" : "given") << "\""
      << ", \"elements\": " << JsonList(a.elements, [](int z) { return std::to_string(z); })
      << ", \"condition_composition\": " << flag(a.condition_composition)
      << ", \"condition_crystal_system\": " << flag(a.condition_crystal_system)
      << ", \"condition_space_group\": " << flag(a.condition_space_group)
      << ", \"properties\": " << JsonList(a.properties, JsonString) << "}";
  return out.str();
}

void AddInputs(const model::ModelBundle& bundle, const SideBySideBatch& batch, ArrayDump* dump) {
  const model::GraphBatch<float>& b = batch.whole;
  const int cells = b.cells, atoms = b.atoms();
  // The noisy geometry the batch was built from (float64, as nucleate keeps it).
  std::vector<double> frac, lattice, features, time;
  std::vector<int> steps;
  for (const train::NoisedCell& n : batch.noised) {
    for (const Eigen::Vector3d& f : n.input.frac) frac.insert(frac.end(), f.data(), f.data() + 3);
    for (int r = 0; r < 3; ++r) {
      for (int c = 0; c < 3; ++c) lattice.push_back(n.input.lattice(r, c));
    }
    features.insert(features.end(), n.input.lattice_features.begin(), n.input.lattice_features.end());
    time.push_back(n.input.time);
    steps.push_back(static_cast<int>(n.t));
  }
  dump->AddFloat64("input", "frac", {atoms, 3}, frac.data());
  dump->AddFloat64("input", "lattice", {cells, 3, 3}, lattice.data());
  dump->AddFloat64("input", "lattice_features", {cells, 6}, features.data());
  dump->AddFloat64("input", "time", {cells}, time.data());
  AddIndices(dump, "input", "time_step", steps);
  // What the network consumes.
  AddIndices(dump, "input", "atom_offsets", b.atom_offsets);
  AddIndices(dump, "input", "tokens", b.tokens);
  AddIndices(dump, "input", "edge_sender", b.edge_sender);
  AddIndices(dump, "input", "edge_receiver", b.edge_receiver);
  AddIndices(dump, "input", "edge_offsets", b.edge_offsets);
  AddMatrix(dump, "input", "edge_geometry", b.edge_geometry);
  AddMatrix(dump, "input", "cell_inputs", b.cell_inputs);
  AddMatrix(dump, "input", "composition", b.composition);
  AddMatrix(dump, "input", "composition_present", b.composition_present);
  AddIndices(dump, "input", "crystal_system", b.crystal_system);
  AddIndices(dump, "input", "space_group", b.space_group);
  AddMatrix(dump, "input", "properties", b.properties);
  AddMatrix(dump, "input", "properties_present", b.properties_present);
  // The loss targets: the training step's noise draws as the loss sees them.
  AddMatrix(dump, "target", "coordinate_score", batch.whole_targets.coordinate_score);
  AddMatrix(dump, "target", "lattice_noise", batch.whole_targets.lattice_noise);
  AddIndices(dump, "target", "species", batch.whole_targets.species);
  // The draws themselves and the clean cells they were applied to. Time steps are
  // input/time_step, the lattice noise is target/lattice_noise, the species masks are the atoms
  // with target/species >= 0; condition dropout shows in the input conditions.
  std::vector<double> clean_frac, clean_features;
  std::vector<int> clean_tokens;
  for (const train::CleanCell& c : batch.clean) {
    for (const Eigen::Vector3d& f : c.frac) clean_frac.insert(clean_frac.end(), f.data(), f.data() + 3);
    clean_features.insert(clean_features.end(), c.features.data(), c.features.data() + 6);
    clean_tokens.insert(clean_tokens.end(), c.tokens.begin(), c.tokens.end());
  }
  dump->AddFloat64("noise", "coordinate_displacement", {atoms, 3}, batch.coordinate_displacement.data());
  dump->AddFloat64("noise", "sigma", {cells}, batch.sigma.data());
  dump->AddFloat64("noise", "clean_frac", {atoms, 3}, clean_frac.data());
  dump->AddFloat64("noise", "clean_lattice_features", {cells, 6}, clean_features.data());
  AddIndices(dump, "noise", "clean_tokens", clean_tokens);
  const model::DiffusionProcess process(bundle.schedules, bundle.architecture);
  dump->AddFact("diffusion_steps", std::to_string(process.steps()));
}

}  // namespace

void DumpSideBySide(const model::ModelBundle& bundle, const SideBySideBatch& batch,
                    SideBySideNetwork* network, const std::string& directory) {
  ArrayDump dump(directory);
  const model::nn::ParameterLayout& layout = network->net().layout();
  for (const model::nn::TensorSpec& t : layout.tensors()) {
    dump.AddFloat32("param", t.name, {t.rows, t.cols}, bundle.values.data() + t.offset);
  }
  AddInputs(bundle, batch, &dump);

  // Gradient() runs the forward pass too: its outputs are those of one forward pass.
  const train::LossParts loss = network->Gradient();
  using Output = model::DenoiserOutput<float>;
  AddMatrix(&dump, "output", "coordinate_score", Stack(network->outputs(), &Output::coordinate_score));
  AddMatrix(&dump, "output", "lattice_noise", Stack(network->outputs(), &Output::lattice_noise));
  if (bundle.architecture.species_mode == model::SpeciesMode::kAbsorbing) {
    AddMatrix(&dump, "output", "species_logits", Stack(network->outputs(), &Output::species_logits));
  }
  for (const model::nn::TensorSpec& t : layout.tensors()) {
    dump.AddFloat32("grad", t.name, {t.rows, t.cols}, network->gradient().data() + t.offset);
  }

  dump.AddFact("format", "\"nucleate side-by-side dump 1\"");
  dump.AddFact("architecture", ArchitectureJson(bundle.architecture));
  dump.AddFact("parameters", JsonList(layout.tensors(), [](const model::nn::TensorSpec& t) {
                 return JsonString(t.name);
               }));
  dump.AddFact("cells", std::to_string(kBatchCells));
  dump.AddFact("atoms_per_cell", std::to_string(kAtomsPerCell));
  dump.AddFact("micro_batch_cells", std::to_string(kMicroBatchCells));
  dump.AddFact("edges", std::to_string(batch.whole.edges()));
  const train::LossWeights weights;  // what Gradient() uses
  dump.AddFact("loss_weights", "{\"coordinates\": " + JsonNumber(weights.coordinates) +
                                   ", \"lattice\": " + JsonNumber(weights.lattice) +
                                   ", \"species\": " + JsonNumber(weights.species) + "}");
  dump.AddFact("loss", "{\"coordinates\": " + JsonNumber(loss.coordinates) +
                           ", \"lattice\": " + JsonNumber(loss.lattice) +
                           ", \"species\": " + JsonNumber(loss.species) +
                           ", \"total\": " + JsonNumber(loss.total()) + "}");
  dump.WriteManifest();
}

}  // namespace nucleate::bench
