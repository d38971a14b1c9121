#include "core/train/train_config.h"

#include <string>
#include <vector>

#include <yaml-cpp/yaml.h>

#include "core/common/error.h"
#include "core/common/thread_count.h"
#include "core/model/architecture.h"
#include "core/schedule/limits.h"
#include "core/schedule/sigma_schedule.h"
#include "core/schedule/variance_schedule.h"
#include "core/train/config_section.h"
#include "core/train/unclosed_quote.h"

namespace nucleate::train {
namespace {

// Each reader below reads every key of its section, refuses the keys nobody read, and only then
// checks ranges, so a misspelt key is named as unknown before anything else.

std::string Resolve(const std::string& base, const std::string& path) {
  if (path.empty() || path[0] == '/' || base.empty()) return path;
  return base + (base.back() == '/' ? "" : "/") + path;
}

// ValidateArchitecture needs a vocabulary of elements, which only the data give; hydrogen stands
// in for it so that every other field is checked while the file is read, before any work.
void ValidateArchitectureBeforeData(model::Architecture a) {
  a.elements = {1};
  model::ValidateArchitecture(a);
}

void ReadData(ConfigSection s, const std::string& base, TrainSettings* t) {
  data::DataSource& d = t->data;
  s.Read("directory", &d.directory);
  s.Read("structure_set", &d.structure_set_file);
  s.Read("properties_csv", &d.properties_csv);
  s.ReadList("properties", &d.property_names);
  s.Read("symprec", &d.symprec);
  s.Read("max_structures", &d.max_structures);
  s.Finish();
  s.Check("directory", d.directory.empty() != d.structure_set_file.empty(),
          "give exactly one of data.directory and data.structure_set");
  s.Check("symprec", d.symprec > 0, "must be > 0 (angstrom)");
  s.Check("max_structures", d.max_structures >= 1, "must be >= 1");
  // The property names become the model's ("properties[1]" names the second in the list).
  model::Architecture with_properties;
  with_properties.properties = d.property_names;
  s.Validate([&] { ValidateArchitectureBeforeData(with_properties); });
  d.directory = Resolve(base, d.directory);
  d.structure_set_file = Resolve(base, d.structure_set_file);
  d.properties_csv = Resolve(base, d.properties_csv);
  t->architecture.properties = d.property_names;
  t->data_keys = {{"directory", s.Where("directory")},
                  {"structure_set_file", s.Where("structure_set")},
                  {"properties_csv", s.Where("properties_csv")},
                  {"property_names", s.Where("properties")},
                  {"symprec", s.Where("symprec")},
                  {"max_structures", s.Where("max_structures")}};
}

void ReadSplit(ConfigSection s, SplitSettings* split) {
  s.Read("validation_fraction", &split->validation_fraction);
  s.Read("test_fraction", &split->test_fraction);
  s.Finish();
  s.Check("validation_fraction", split->validation_fraction >= 0 && split->validation_fraction < 1,
          "must lie in [0, 1)");
  s.Check("test_fraction", split->test_fraction >= 0 && split->test_fraction < 1,
          "must lie in [0, 1)");
  s.Check("test_fraction", split->validation_fraction + split->test_fraction < 1,
          "validation_fraction + test_fraction must leave compositions to train on");
}

void ReadModel(ConfigSection s, model::Architecture* a) {
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
  std::vector<std::string> conditions;
  s.ReadList("conditions", &conditions);
  s.Finish();
  s.Check("species", species == "given" || species == "absorbing", "must be given or absorbing");
  a->species_mode = species == "given" ? model::SpeciesMode::kGiven : model::SpeciesMode::kAbsorbing;
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
  // Field names of ValidateArchitecture are this section's keys (properties were checked under
  // data and pass here).
  s.Validate([&] { ValidateArchitectureBeforeData(*a); });
}

void ReadDiffusion(ConfigSection s, model::ModelSchedules* d) {
  long long steps = d->lattice.steps;
  s.Read("steps", &steps);
  std::string lattice = "cosine";
  s.Read("lattice_schedule", &lattice);
  s.Read("sigma_min", &d->coordinates.sigma_min);
  s.Read("sigma_max", &d->coordinates.sigma_max);
  s.Finish();
  s.Check("steps", steps >= 2, "must be >= 2");
  d->lattice.steps = d->coordinates.steps = d->species.steps = steps;
  if (lattice == "cosine") {
    d->lattice.kind = schedule::VarianceKind::kCosine;
  } else if (lattice == "linear") {
    d->lattice.kind = schedule::VarianceKind::kLinear;
  } else {
    s.Check("lattice_schedule", false, "must be cosine or linear");
  }
  s.Check("sigma_min", d->coordinates.sigma_min > 0, "must be > 0");
  s.Check("sigma_max", d->coordinates.sigma_max > d->coordinates.sigma_min,
          "must be > sigma_min");
  // The schedules' own limits (steps up to max_steps, sigma_max up to 100), as training will
  // meet them when it builds the tables; their field names are this section's keys.
  s.Validate([&] {
    const schedule::ScheduleLimits limits;
    schedule::ValidateVarianceParams(d->lattice, limits);
    schedule::ValidateSigmaParams(d->coordinates, limits);
  });
}

void ReadTraining(ConfigSection s, OptimisationSettings* o) {
  long long seed = o->seed;
  s.Read("seed", &seed);
  s.Read("epochs", &o->epochs);
  s.Read("batch_size", &o->batch_size);
  s.Read("micro_batch", &o->micro_batch);
  s.Read("learning_rate", &o->adamw.learning_rate);
  s.Read("beta1", &o->adamw.beta1);
  s.Read("beta2", &o->adamw.beta2);
  s.Read("weight_decay", &o->adamw.weight_decay);
  s.Read("warmup_steps", &o->warmup_steps);
  s.Read("final_learning_rate_fraction", &o->final_learning_rate_fraction);
  s.Read("gradient_clip", &o->gradient_clip);
  s.Read("ema_decay", &o->ema_decay);
  ConfigSection weights = s.Child("loss_weights");
  weights.Read("coordinates", &o->loss_weights.coordinates);
  weights.Read("lattice", &o->loss_weights.lattice);
  weights.Read("species", &o->loss_weights.species);
  weights.Finish();
  s.Read("condition_dropout", &o->dropout.each);
  s.Read("all_conditions_dropout", &o->dropout.all);
  s.Read("threads", &o->threads);
  s.Read("checkpoint_every_epochs", &o->checkpoint_every_epochs);
  s.Finish();

  s.Check("seed", seed >= 0 && seed <= 0xFFFFFFFFLL, "must lie in 0..4294967295");
  o->seed = static_cast<std::uint32_t>(seed);
  s.Check("epochs", o->epochs >= 1, "must be >= 1");
  s.Check("batch_size", o->batch_size >= 1, "must be >= 1");
  s.Check("micro_batch", o->micro_batch >= 1, "must be >= 1");
  s.Check("learning_rate", o->adamw.learning_rate > 0, "must be > 0");
  s.Check("beta1", o->adamw.beta1 >= 0 && o->adamw.beta1 < 1, "must lie in [0, 1)");
  s.Check("beta2", o->adamw.beta2 >= 0 && o->adamw.beta2 < 1, "must lie in [0, 1)");
  s.Check("weight_decay", o->adamw.weight_decay >= 0, "must be >= 0");
  s.Check("warmup_steps", o->warmup_steps >= 0, "must be >= 0");
  s.Check("final_learning_rate_fraction",
          o->final_learning_rate_fraction >= 0 && o->final_learning_rate_fraction <= 1,
          "must lie in [0, 1]");
  s.Check("gradient_clip", o->gradient_clip >= 0, "must be >= 0 (0 disables clipping)");
  s.Check("ema_decay", o->ema_decay >= 0 && o->ema_decay < 1, "must lie in [0, 1)");
  weights.Check("coordinates", o->loss_weights.coordinates >= 0, "must be >= 0");
  weights.Check("lattice", o->loss_weights.lattice >= 0, "must be >= 0");
  weights.Check("species", o->loss_weights.species >= 0, "must be >= 0");
  s.Check("condition_dropout", o->dropout.each >= 0 && o->dropout.each <= 1, "must lie in [0, 1]");
  s.Check("all_conditions_dropout", o->dropout.all >= 0 && o->dropout.all <= 1,
          "must lie in [0, 1]");
  // The one reading of thread counts, as every method has it (above 1024 is LimitExceeded); the
  // count it resolves to depends on the machine, so the setting keeps 0 for "all".
  s.Validate([&] { ResolveThreadCount(o->threads, "threads"); });
  s.Check("checkpoint_every_epochs", o->checkpoint_every_epochs >= 1, "must be >= 1");
}

void ReadOutput(ConfigSection s, const std::string& base, OutputSettings* o) {
  s.Read("model", &o->model);
  s.Read("checkpoint", &o->checkpoint);
  s.Read("resume", &o->resume);
  s.Finish();
  s.Check("model", !o->model.empty(), "required: where to write the trained model");
  s.Check("resume", !o->resume || !o->checkpoint.empty(), "resume needs output.checkpoint");
  o->model = Resolve(base, o->model);
  o->checkpoint = Resolve(base, o->checkpoint);
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
  RefuseUnclosedQuotes(root, yaml_text, source_name);
  // An empty file is an empty mapping (it then lacks the required sections); a list or a single
  // value is not a configuration at all.
  if (root && !root.IsNull() && !root.IsMap()) {
    throw InvalidArgument(source_name + ":" + std::to_string(root.Mark().line + 1),
                          std::string("the configuration must be a mapping of sections (data:, "
                                      "output:, ...), not ") +
                              (root.IsSequence() ? "a list" : "a single value"));
  }
  TrainSettings t;
  t.yaml = yaml_text;
  ConfigSection top(root, "", source_name);
  ConfigSection data = top.Child("data"), split = top.Child("split"), model = top.Child("model"),
                diffusion = top.Child("diffusion"), training = top.Child("training"),
                output = top.Child("output");
  top.Finish();
  for (const char* required : {"data", "output"}) {
    top.Check(required, top.Has(required),
              std::string("required section ") + required + " is missing");
  }
  ReadData(data, base_directory, &t);
  ReadSplit(split, &t.split);
  ReadModel(model, &t.architecture);
  ReadDiffusion(diffusion, &t.diffusion);
  ReadTraining(training, &t.optimisation);
  ReadOutput(output, base_directory, &t.output);
  return t;
}

Error AtConfigKey(const Error& error, const TrainSettings& settings) {
  const std::string& field = error.field();
  const std::size_t end = field.find_first_of("[.");
  const auto found = settings.data_keys.find(field.substr(0, end));
  if (found == settings.data_keys.end()) return error;
  return Error(error.kind(), found->second + (end == std::string::npos ? "" : field.substr(end)),
               error.detail());
}

}  // namespace nucleate::train
