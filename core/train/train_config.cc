#include "core/common/thread_count.h"
#include "core/train/train_config.h"

#include <cmath>
#include <limits>
#include <set>
#include <string>
#include <vector>

#include <yaml-cpp/yaml.h>

#include "core/common/error.h"

namespace nucleate::train {
namespace {

// A mapping node with the keys it may hold; reading a key marks it used, and Finish() rejects any
// key nobody read.
class Section {
 public:
  Section(const YAML::Node& node, std::string path, const std::string& source)
      : node_(node), path_(std::move(path)), source_(source) {
    if (node_ && !node_.IsNull() && !node_.IsMap()) Fail(path_, node_, "must be a mapping");
  }

  bool Has(const std::string& key) const { return node_ && node_.IsMap() && node_[key]; }

  Section Child(const std::string& key) {
    used_.insert(key);
    return Section(Has(key) ? node_[key] : YAML::Node(), Join(key), source_);
  }

  template <typename V>
  void Read(const std::string& key, V* value) {
    used_.insert(key);
    if (!Has(key)) return;
    const YAML::Node v = node_[key];
    if (!v.IsScalar()) Fail(Join(key), v, "must be a single value");
    try {
      *value = v.as<V>();
    } catch (const YAML::Exception&) {
      Fail(Join(key), v, "cannot read '" + v.Scalar() + "' as " + TypeName<V>());
    }
    if constexpr (std::is_floating_point_v<V>) {
      if (!std::isfinite(*value)) Fail(Join(key), v, "must be finite");
    }
  }

  void ReadList(const std::string& key, std::vector<std::string>* out) {
    used_.insert(key);
    if (!Has(key)) return;
    const YAML::Node v = node_[key];
    if (!v.IsSequence()) Fail(Join(key), v, "must be a list");
    out->clear();
    for (const auto& item : v) {
      if (!item.IsScalar()) Fail(Join(key), item, "entries must be single values");
      out->push_back(item.Scalar());
    }
  }

  // Range checks report the key's own line.
  void Check(const std::string& key, bool ok, const std::string& message) const {
    if (!ok) Fail(Join(key), Has(key) ? node_[key] : node_, message);
  }

  void Finish() const {
    if (!node_ || !node_.IsMap()) return;
    for (const auto& entry : node_) {
      const std::string key = entry.first.Scalar();
      if (!used_.count(key)) {
        std::string known;
        for (const auto& k : used_) known += (known.empty() ? "" : ", ") + k;
        Fail(Join(key), entry.first, "unknown key (known here: " + known + ")");
      }
    }
  }

  [[noreturn]] void Fail(const std::string& path, const YAML::Node& at,
                         const std::string& message) const {
    const int line = at.Mark().line >= 0 ? at.Mark().line + 1 : 0;
    throw InvalidArgument(source_ + ":" + std::to_string(line) + ": " + path, message);
  }

 private:
  std::string Join(const std::string& key) const { return path_.empty() ? key : path_ + "." + key; }
  template <typename V>
  static std::string TypeName() {
    if constexpr (std::is_same_v<V, bool>) return "true or false";
    if constexpr (std::is_integral_v<V>) return "an integer";
    if constexpr (std::is_floating_point_v<V>) return "a number";
    return "text";
  }

  YAML::Node node_;
  std::string path_;
  const std::string& source_;
  std::set<std::string> used_;
};

std::string Resolve(const std::string& base, const std::string& path) {
  if (path.empty() || path[0] == '/' || base.empty()) return path;
  return base + (base.back() == '/' ? "" : "/") + path;
}

void ReadData(Section s, const std::string& base, TrainSettings* t) {
  data::DataSource& d = t->data;
  s.Read("directory", &d.directory);
  s.Read("structure_set", &d.structure_set_file);
  s.Read("properties_csv", &d.properties_csv);
  s.ReadList("properties", &d.property_names);
  s.Read("symprec", &d.symprec);
  s.Read("max_structures", &d.max_structures);
  s.Check("directory", d.directory.empty() != d.structure_set_file.empty(),
          "give exactly one of data.directory and data.structure_set");
  s.Check("symprec", d.symprec > 0, "must be > 0 (angstrom)");
  s.Check("max_structures", d.max_structures >= 1, "must be >= 1");
  d.directory = Resolve(base, d.directory);
  d.structure_set_file = Resolve(base, d.structure_set_file);
  d.properties_csv = Resolve(base, d.properties_csv);
  t->architecture.properties = d.property_names;
  s.Finish();
}

void ReadSplit(Section s, SplitSettings* split) {
  s.Read("validation_fraction", &split->validation_fraction);
  s.Read("test_fraction", &split->test_fraction);
  s.Check("validation_fraction", split->validation_fraction >= 0 && split->validation_fraction < 1,
          "must lie in [0, 1)");
  s.Check("test_fraction", split->test_fraction >= 0 && split->test_fraction < 1,
          "must lie in [0, 1)");
  s.Check("test_fraction", split->validation_fraction + split->test_fraction < 1,
          "validation_fraction + test_fraction must leave compositions to train on");
  s.Finish();
}

void ReadModel(Section s, model::Architecture* a) {
  s.Read("hidden", &a->hidden);
  s.Read("layers", &a->layers);
  s.Read("fourier_frequencies", &a->fourier_frequencies);
  s.Read("radial_basis", &a->radial_basis);
  s.Read("radial_max", &a->radial_max);
  s.Read("time_embedding", &a->time_embedding);
  s.Read("cutoff_from_atoms", &a->cutoff_from_atoms);
  s.Read("cutoff", &a->cutoff);
  std::string species = "given";
  s.Read("species", &species);
  s.Check("species", species == "given" || species == "absorbing", "must be given or absorbing");
  a->species_mode = species == "given" ? model::SpeciesMode::kGiven : model::SpeciesMode::kAbsorbing;
  std::vector<std::string> conditions;
  s.ReadList("conditions", &conditions);
  for (const std::string& c : conditions) {
    if (c == "composition") {
      a->condition_composition = true;
    } else if (c == "crystal_system") {
      a->condition_crystal_system = true;
    } else if (c == "space_group") {
      a->condition_space_group = true;
    } else {
      s.Check("conditions", false,
              "unknown condition '" + c +
                  "' (known: composition, crystal_system, space_group; scalar properties are "
                  "listed under data.properties)");
    }
  }
  s.Finish();
}

void ReadDiffusion(Section s, model::ModelSchedules* d) {
  long long steps = d->lattice.steps;
  s.Read("steps", &steps);
  s.Check("steps", steps >= 2, "must be >= 2");
  d->lattice.steps = d->coordinates.steps = d->species.steps = steps;
  std::string lattice = "cosine";
  s.Read("lattice_schedule", &lattice);
  if (lattice == "cosine") {
    d->lattice.kind = schedule::VarianceKind::kCosine;
  } else if (lattice == "linear") {
    d->lattice.kind = schedule::VarianceKind::kLinear;
  } else {
    s.Check("lattice_schedule", false, "must be cosine or linear");
  }
  s.Read("sigma_min", &d->coordinates.sigma_min);
  s.Read("sigma_max", &d->coordinates.sigma_max);
  s.Check("sigma_min", d->coordinates.sigma_min > 0, "must be > 0");
  s.Check("sigma_max", d->coordinates.sigma_max > d->coordinates.sigma_min,
          "must be > sigma_min");
  s.Finish();
}

void ReadTraining(Section s, OptimisationSettings* o) {
  long long seed = o->seed;
  s.Read("seed", &seed);
  s.Check("seed", seed >= 0 && seed <= 0xFFFFFFFFLL, "must lie in 0..4294967295");
  o->seed = static_cast<std::uint32_t>(seed);
  s.Read("epochs", &o->epochs);
  s.Check("epochs", o->epochs >= 1, "must be >= 1");
  s.Read("batch_size", &o->batch_size);
  s.Check("batch_size", o->batch_size >= 1, "must be >= 1");
  s.Read("micro_batch", &o->micro_batch);
  s.Check("micro_batch", o->micro_batch >= 1, "must be >= 1");
  s.Read("learning_rate", &o->adamw.learning_rate);
  s.Check("learning_rate", o->adamw.learning_rate > 0, "must be > 0");
  s.Read("beta1", &o->adamw.beta1);
  s.Check("beta1", o->adamw.beta1 >= 0 && o->adamw.beta1 < 1, "must lie in [0, 1)");
  s.Read("beta2", &o->adamw.beta2);
  s.Check("beta2", o->adamw.beta2 >= 0 && o->adamw.beta2 < 1, "must lie in [0, 1)");
  s.Read("weight_decay", &o->adamw.weight_decay);
  s.Check("weight_decay", o->adamw.weight_decay >= 0, "must be >= 0");
  s.Read("warmup_steps", &o->warmup_steps);
  s.Check("warmup_steps", o->warmup_steps >= 0, "must be >= 0");
  s.Read("final_learning_rate_fraction", &o->final_learning_rate_fraction);
  s.Check("final_learning_rate_fraction",
          o->final_learning_rate_fraction >= 0 && o->final_learning_rate_fraction <= 1,
          "must lie in [0, 1]");
  s.Read("gradient_clip", &o->gradient_clip);
  s.Check("gradient_clip", o->gradient_clip >= 0, "must be >= 0 (0 disables clipping)");
  s.Read("ema_decay", &o->ema_decay);
  s.Check("ema_decay", o->ema_decay >= 0 && o->ema_decay < 1, "must lie in [0, 1)");
  Section weights = s.Child("loss_weights");
  weights.Read("coordinates", &o->loss_weights.coordinates);
  weights.Read("lattice", &o->loss_weights.lattice);
  weights.Read("species", &o->loss_weights.species);
  weights.Check("coordinates", o->loss_weights.coordinates >= 0, "must be >= 0");
  weights.Check("lattice", o->loss_weights.lattice >= 0, "must be >= 0");
  weights.Check("species", o->loss_weights.species >= 0, "must be >= 0");
  weights.Finish();
  s.Read("condition_dropout", &o->dropout.each);
  s.Check("condition_dropout", o->dropout.each >= 0 && o->dropout.each <= 1, "must lie in [0, 1]");
  s.Read("all_conditions_dropout", &o->dropout.all);
  s.Check("all_conditions_dropout", o->dropout.all >= 0 && o->dropout.all <= 1,
          "must lie in [0, 1]");
  s.Read("threads", &o->threads);
  s.Check("threads", o->threads >= 0 && o->threads <= kMaxThreads,
          "must be 0 (all hardware threads) to " + std::to_string(kMaxThreads));
  s.Read("checkpoint_every_epochs", &o->checkpoint_every_epochs);
  s.Check("checkpoint_every_epochs", o->checkpoint_every_epochs >= 1, "must be >= 1");
  s.Finish();
}

void ReadOutput(Section s, const std::string& base, OutputSettings* o) {
  s.Read("model", &o->model);
  s.Check("model", !o->model.empty(), "required: where to write the trained model");
  s.Read("checkpoint", &o->checkpoint);
  s.Read("resume", &o->resume);
  s.Check("resume", !o->resume || !o->checkpoint.empty(), "resume needs output.checkpoint");
  o->model = Resolve(base, o->model);
  o->checkpoint = Resolve(base, o->checkpoint);
  s.Finish();
}

}  // namespace

TrainSettings ReadTrainConfig(const std::string& yaml_text, const std::string& base_directory,
                              const std::string& source_name) {
  YAML::Node root;
  try {
    root = YAML::Load(yaml_text);
  } catch (const YAML::Exception& e) {
    throw InvalidArgument(source_name + ":" + std::to_string(e.mark.line + 1),
                          "not valid YAML: " + e.msg);
  }
  TrainSettings t;
  t.yaml = yaml_text;
  Section top(root, "", source_name);
  if (!root.IsMap()) top.Fail("", root, "the configuration must be a mapping of sections");
  for (const char* required : {"data", "output"}) {
    top.Check(required, top.Has(required), std::string("required section ") + required + " is missing");
  }
  ReadData(top.Child("data"), base_directory, &t);
  ReadSplit(top.Child("split"), &t.split);
  ReadModel(top.Child("model"), &t.architecture);
  ReadDiffusion(top.Child("diffusion"), &t.diffusion);
  ReadTraining(top.Child("training"), &t.optimisation);
  ReadOutput(top.Child("output"), base_directory, &t.output);
  top.Finish();
  return t;
}

}  // namespace nucleate::train
