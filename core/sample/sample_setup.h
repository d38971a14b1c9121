// Where each sample's chain starts: its atoms and species, its conditions, the parts it must keep,
// and its initial noisy state, all drawn from the sample's own random streams. The job is checked
// once, here, before any sample runs.
#pragma once

#include <cstdint>
#include <vector>

#include "core/model/bundle/model_bundle.h"
#include "core/model/diffusion.h"
#include "core/model/lattice_features.h"
#include "core/sample/chain.h"
#include "core/sample/reverse_levels.h"
#include "core/sample/reverse_step.h"
#include "core/sample/sample_job.h"

namespace nucleate::sample {

struct SampleStart {
  ChainState state;
  ChainConstraints constraints;
  std::size_t first_level = 0;  // index into the levels: 0 unless a variation starts lower
  // The output cell is exactly this lattice (the constrained task's fixed lattice), not one
  // rebuilt from the features (which would be rotated to standard orientation).
  bool keep_lattice = false;
  Eigen::Matrix3d lattice = Eigen::Matrix3d::Identity();
};

class SampleSetup {
 public:
  // Checks the job against the model: InvalidArgument naming the field ("composition.formula[1]",
  // "conditions.crystal_system", "variation.strength", ...) or LimitExceeded naming the limit
  // ("limits.max_atoms"). The references must outlive this object.
  SampleSetup(const model::ModelBundle& bundle, const std::vector<ReverseLevel>& levels,
              const SampleJob& job);

  // The start of sample `index` (the absolute index: first_index + i).
  SampleStart Start(std::uint32_t index) const;
  // The largest cell any sample of the job can have (for the memory estimate).
  int max_atoms() const { return max_atoms_; }
  const model::LatticeStatistics& statistics() const { return statistics_; }

 private:
  int Token(int atomic_number, const std::string& field) const;
  int DrawAtoms(std::uint32_t index, int* formula_units) const;
  ChainConditions Conditions(const std::vector<int>& tokens) const;

  const model::ModelBundle& bundle_;
  const std::vector<ReverseLevel>& levels_;
  const SampleJob& job_;
  model::LatticeStatistics statistics_;
  std::vector<double> properties_;      // standardised, NaN = missing
  std::vector<char> allowed_;           // per vocabulary element (de novo), empty = all
  structure::Crystal given_;            // variation / constrained: the structure, reduced or not
  int max_atoms_ = 0;
};

}  // namespace nucleate::sample
