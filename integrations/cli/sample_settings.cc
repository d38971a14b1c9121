#include "sample_settings.h"

#include <CLI/CLI.hpp>

namespace nucleate::cli {

const std::vector<SettingSpec>& SampleSettingSpecs() {
  using K = SettingKind;
  static const std::vector<SettingSpec> specs = {
      {"model", K::kValue, nullptr, true, "FILE",
       "The model file written by nucleate train (required)"},
      {"out", K::kValue, nullptr, true, "DIR",
       "Folder for the candidate files, created if missing (required)"},
      {"composition", K::kValue, "composition", false, "FORMULA",
       "Task: structures of this formula, e.g. SrTiO3 or Ca3(PO4)2"},
      {"formula_units", K::kValue, "composition", false, "N|MIN-MAX",
       "Formula units per cell: N or MIN-MAX (1)"},
      {"de_novo", K::kSwitch, "de_novo", false, nullptr,
       "Task: new compositions too (models trained with species: absorbing)"},
      {"elements", K::kList, "de_novo", false, "LIST",
       "Allowed elements, e.g. Li,Fe,O (default: the model's)"},
      {"atoms", K::kValue, "de_novo", false, "N|MIN-MAX",
       "Atoms per cell: N or MIN-MAX (default: 1 to the largest cell the model saw)"},
      {"vary", K::kValue, "vary", true, "FILE", "Task: relatives of the one structure in FILE"},
      {"strength", K::kValue, "vary", false, "S",
       "How far to noise before denoising, fraction of the steps in (0, 1] (0.3)"},
      {"vary_species", K::kSwitch, "vary", false, nullptr,
       "Regenerate the species too (absorbing models)"},
      {"constrain", K::kValue, "constrain", true, "FILE",
       "Task: generate around the one structure in FILE (a host framework)"},
      {"fix_atoms", K::kList, "constrain", false, "LIST|all",
       "Atoms kept exactly, indices from 0 (0,1,2) or all"},
      {"fix_lattice", K::kSwitch, "constrain", false, nullptr, "Keep the cell exactly"},
      {"add", K::kList, "constrain", false, "LIST",
       "Atoms to place: element symbols, 0 or ? for a generated species (Li,Li,0)"},
      {"count", K::kValue, nullptr, false, "N", "Candidates to generate (10)"},
      {"seed", K::kValue, nullptr, false, "S", "Random seed, 0..4294967295 (0)"},
      {"first_index", K::kValue, nullptr, false, "I",
       "Index of the first candidate in the seed's stream (0): split a run across jobs"},
      {"threads", K::kValue, nullptr, false, "T",
       "Threads, 0 = every core (0); results do not depend on it"},
      {"sampler", K::kValue, nullptr, false, "NAME",
       "ddpm, ddim, pc (predictor-corrector) or ode (ddpm)"},
      {"steps", K::kValue, nullptr, false, "N",
       "Reverse steps, evenly respaced (default: the model's)"},
      {"eta", K::kValue, nullptr, false, "X", "DDIM noise, 0 = deterministic (0)"},
      {"ddpm_variance", K::kValue, nullptr, false, "NAME",
       "DDPM step variance: posterior or forward"},
      {"corrector_steps", K::kValue, nullptr, false, "N",
       "Langevin corrector steps per step, pc (1)"},
      {"snr", K::kValue, nullptr, false, "X", "Corrector signal-to-noise ratio, pc (0.16)"},
      {"crystal_system", K::kValue, nullptr, false, "NAME|1..7",
       "Condition: triclinic, monoclinic, orthorhombic, tetragonal, trigonal, hexagonal, cubic or "
       "1..7"},
      {"space_group", K::kValue, nullptr, false, "N", "Condition: space group number 1..230"},
      {"property", K::kProperties, nullptr, false, "NAME=VALUE",
       "Condition: NAME=VALUE, a property the model was trained on (repeatable)"},
      {"guidance", K::kValue, nullptr, false, "W",
       "Classifier-free guidance: 0 unconditional, 1 conditional (1), above 1 steers harder"},
      {"symprec", K::kValue, nullptr, false, "X", "Symmetry tolerance in angstrom (0.1)"},
      {"symmetrise", K::kSwitch, nullptr, false, nullptr,
       "Also write each candidate made exactly symmetric (sample-<index>-symmetrised.cif)"},
      {"multi_cif", K::kSwitch, nullptr, false, nullptr,
       "One CIF with a data block per candidate (candidates.cif) instead of one file each"},
      {"force", K::kSwitch, nullptr, false, nullptr, "Overwrite candidate files already in --out"},
      {"log", K::kValue, nullptr, true, "FILE", "Also append progress and log lines to this file"},
      {"json", K::kSwitch, nullptr, false, nullptr,
       "Print the Sample reply (protobuf JSON) instead of the table"},
  };
  return specs;
}

const SettingSpec* FindSampleSetting(const std::string& key) {
  for (const SettingSpec& spec : SampleSettingSpecs()) {
    if (key == spec.key) return &spec;
  }
  return nullptr;
}

std::string FlagName(const std::string& key) {
  std::string flag = "--" + key;
  for (char& c : flag) {
    if (c == '_') c = '-';
  }
  return flag;
}

std::string SampleSettings::Task() const {
  std::string task;
  for (const SettingSpec& spec : SampleSettingSpecs()) {
    if (spec.task == nullptr || std::string(spec.key) != spec.task) continue;
    const auto found = values.find(spec.key);
    if (found == values.end()) continue;
    if (spec.kind == SettingKind::kSwitch && found->second.text != "true") continue;
    if (!task.empty()) {
      throw CLI::ValidationError(
          found->second.origin, "one task only, and " + values.at(task).origin + " is one already");
    }
    task = spec.key;
  }
  return task;
}

SampleSettings MergeSettings(const SampleSettings& job_file, const SampleSettings& command_line) {
  const std::string task = command_line.Task();
  SampleSettings merged;
  for (const auto& [key, setting] : job_file.values) {
    const SettingSpec* spec = FindSampleSetting(key);
    if (!task.empty() && spec->task != nullptr && task != spec->task) continue;
    merged.values[key] = setting;
  }
  for (const auto& [key, setting] : command_line.values) merged.values[key] = setting;
  merged.properties = job_file.properties;
  for (const auto& [name, setting] : command_line.properties) merged.properties[name] = setting;
  return merged;
}

}  // namespace nucleate::cli
