#include "integrations/demo/corpus/manifest.h"

#include <set>
#include <sstream>

#include "core/elements/elements.h"
#include "core/structure/composition.h"

namespace nucleate::demo::corpus {
namespace {

std::string Quote(const std::string& text) {
  std::string out = "\"";
  for (char ch : text) {
    if (ch == '"' || ch == '\\') out += '\\';
    out += ch;
  }
  return out + "\"";
}

template <typename Key>
std::string KeyText(const Key& key) {
  std::ostringstream out;
  out << key;
  return Quote(out.str());
}

template <typename Map>
void WriteCounts(std::ostringstream& out, const std::string& indent, const Map& counts) {
  out << "{";
  bool first = true;
  for (const auto& [key, value] : counts) {
    out << (first ? "\n" : ",\n") << indent << "  " << KeyText(key) << ": " << value;
    first = false;
  }
  out << (first ? "}" : "\n" + indent + "}");
}

void WriteList(std::ostringstream& out, const std::vector<std::string>& items) {
  out << "[";
  for (std::size_t k = 0; k < items.size(); ++k) out << (k ? ", " : "") << Quote(items[k]);
  out << "]";
}

}  // namespace

CorpusSummary Summarise(const std::vector<PreparedType>& catalogue, const Corpus& corpus) {
  CorpusSummary s;
  std::set<std::string> formulas;
  std::map<std::string, std::set<int>> drawn;  // type -> composition indices
  std::set<int> present;
  for (const CorpusEntry& entry : corpus.entries) {
    const PreparedType& type = catalogue[static_cast<std::size_t>(entry.type)];
    ++s.per_type[type.type->name];
    drawn[type.type->name].insert(entry.composition);
    ++s.per_crystal_system[symmetry::CrystalSystemName(type.system)];
    formulas.insert(type.compositions[static_cast<std::size_t>(entry.composition)].formula);
    const int atoms = static_cast<int>(entry.crystal.size());
    ++s.atom_counts[atoms];
    for (const auto& [z, count] : structure::CountElements(entry.crystal.numbers)) {
      ++s.per_element[elements::FindElement(z)->symbol];
      present.insert(z);
    }
  }
  for (const auto& [name, indices] : drawn) s.compositions_per_type[name] = static_cast<std::int64_t>(indices.size());
  s.distinct_compositions = static_cast<std::int64_t>(formulas.size());
  if (!s.atom_counts.empty()) {
    s.min_atoms = s.atom_counts.begin()->first;
    s.max_atoms = s.atom_counts.rbegin()->first;
  }
  for (int z : present) {
    const elements::Element& e = *elements::FindElement(z);
    if (e.toxic) s.toxic_elements.push_back(e.symbol);
    if (e.radioactive) s.radioactive_elements.push_back(e.symbol);
  }
  return s;
}

std::string ManifestJson(const std::vector<PreparedType>& catalogue, const Corpus& corpus,
                         const CorpusOptions& options, const std::string& structure_set_file) {
  const CorpusSummary s = Summarise(catalogue, corpus);
  std::ostringstream out;
  out.precision(6);
  out << "{\n";
  out << "  \"generator\": \"nucleate-corpus\",\n";
  out << "  \"generator_version\": " << kGeneratorVersion << ",\n";
  out << "  \"note\": " << Quote("Synthetic structures built from textbook structure types with "
                                 "substituted elements: hypotheses for training a demo model, not "
                                 "measured or computed crystals.") << ",\n";
  out << "  \"structure_set\": " << Quote(structure_set_file) << ",\n";
  out << "  \"seed\": " << options.seed << ",\n";
  out << "  \"count\": " << options.count << ",\n";
  out << "  \"max_strain\": " << options.max_strain << ",\n";
  out << "  \"displacement_rms_angstrom\": " << options.displacement_rms << ",\n";
  out << "  \"structures\": " << corpus.entries.size() << ",\n";
  out << "  \"dropped\": " << corpus.dropped << ",\n";
  out << "  \"dropped_by_problem\": ";
  WriteCounts(out, "  ", corpus.dropped_by_problem);
  out << ",\n";
  out << "  \"distinct_compositions\": " << s.distinct_compositions << ",\n";
  out << "  \"structure_type_count\": " << s.per_type.size() << ",\n";
  out << "  \"crystal_system_count\": " << s.per_crystal_system.size() << ",\n";
  out << "  \"element_count\": " << s.per_element.size() << ",\n";
  out << "  \"min_atoms\": " << s.min_atoms << ",\n";
  out << "  \"max_atoms\": " << s.max_atoms << ",\n";
  out << "  \"structure_types\": [";
  for (std::size_t t = 0; t < catalogue.size(); ++t) {
    const PreparedType& type = catalogue[t];
    const std::string name = type.type->name;
    const auto count = s.per_type.count(name) ? s.per_type.at(name) : 0;
    const auto drawn = s.compositions_per_type.count(name) ? s.compositions_per_type.at(name) : 0;
    out << (t ? ",\n" : "\n") << "    {\"name\": " << Quote(name)
        << ", \"prototype\": " << Quote(type.type->prototype)
        << ", \"space_group\": " << type.type->group->number
        << ", \"space_group_symbol\": " << Quote(type.type->group->symbol)
        << ", \"crystal_system\": " << Quote(symmetry::CrystalSystemName(type.system))
        << ", \"atoms_per_cell\": " << type.primitive_atoms
        << ", \"compositions_available\": " << type.compositions.size()
        << ", \"compositions_drawn\": " << drawn << ", \"structures\": " << count << "}";
  }
  out << "\n  ],\n";
  out << "  \"crystal_systems\": ";
  WriteCounts(out, "  ", s.per_crystal_system);
  out << ",\n  \"elements\": ";
  WriteCounts(out, "  ", s.per_element);
  out << ",\n  \"atom_counts\": ";
  WriteCounts(out, "  ", s.atom_counts);
  out << ",\n  \"toxic_elements\": ";
  WriteList(out, s.toxic_elements);
  out << ",\n  \"radioactive_elements\": ";
  WriteList(out, s.radioactive_elements);
  out << ",\n  \"sources\": {\n"
      << "    \"wyckoff_positions\": \"International Tables for Crystallography, Vol. A; free "
         "coordinates and cell shapes are typical values, from memory\",\n"
      << "    \"ionic_radii\": \"R. D. Shannon, Acta Cryst. A32 (1976) 751, from memory, checked "
         "against pymatgen's copy\",\n"
      << "    \"metallic_radii\": \"Greenwood and Earnshaw, Chemistry of the Elements, 2nd ed. "
         "(1997), 12-fold coordination, from memory\",\n"
      << "    \"oxidation_states\": \"core/elements common oxidation states\",\n"
      << "    \"validity\": \"core/checks CheckValidity, default thresholds\"\n"
      << "  }\n";
  out << "}\n";
  return out.str();
}

}  // namespace nucleate::demo::corpus
