// nucleate-corpus: writes the demo's synthetic training corpus (README.md beside this file).
// Exit 0 on success, 1 when generation or writing failed (one line on stderr), 2 for a
// command-line mistake.
#include <chrono>
#include <cstdint>
#include <filesystem>
#include <iostream>
#include <string>

#include <CLI/CLI.hpp>

#include "core/common/error.h"
#include "integrations/demo/corpus/catalogue.h"
#include "integrations/demo/corpus/corpus.h"
#include "integrations/demo/corpus/corpus_files.h"
#include "integrations/demo/corpus/manifest.h"

namespace {

constexpr int kExitFailed = 1;
constexpr int kExitUsage = 2;

std::string Join(const std::vector<std::string>& items) {
  std::string text;
  for (const std::string& item : items) text += (text.empty() ? "" : ", ") + item;
  return text.empty() ? "none" : text;
}

}  // namespace

int main(int argc, char** argv) {
  using namespace nucleate::demo::corpus;
  CLI::App app{"nucleate-corpus: a synthetic training corpus of textbook structure types for the "
               "nucleate demo (every structure is a hypothesis, not a measured crystal)"};
  std::string out_dir, structure_set = "corpus.pb", cif_dir;
  CorpusOptions options;
  app.add_option("--out", out_dir, "Folder for the corpus and its manifest (created)")->required();
  app.add_option("--seed", options.seed, "Random seed, 0..4294967295")->capture_default_str();
  app.add_option("--count", options.count, "Number of structures")->capture_default_str();
  app.add_option("--max-strain", options.max_strain,
                 "Largest relative change of each free cell parameter, 0..0.1")
      ->capture_default_str();
  app.add_option("--displacement-rms", options.displacement_rms,
                 "Root mean square atom displacement in angstrom, 0..0.1")
      ->capture_default_str();
  app.add_option("--structure-set", structure_set,
                 "File name of the binary StructureSet inside --out")->capture_default_str();
  CLI::Option* cif_option =
      app.add_option("--cif-dir", cif_dir,
                     "Also write one CIF per structure, into this folder (default: OUT/cif)")
          ->expected(0, 1);
  try {
    app.parse(argc, argv);
  } catch (const CLI::ParseError& error) {
    const int code = app.exit(error);
    return code == 0 ? 0 : kExitUsage;
  }

  try {
    const auto start = std::chrono::steady_clock::now();
    ValidateOptions(options);
    const std::vector<PreparedType> catalogue = PrepareCatalogue();
    const Corpus corpus = GenerateCorpus(catalogue, options);

    const std::filesystem::path out(out_dir);
    std::error_code error;
    std::filesystem::create_directories(out, error);
    if (error) throw nucleate::Error(nucleate::ErrorKind::kIo, out_dir, "cannot create: " + error.message());
    WriteFileAtomically(out / structure_set, StructureSetBytes(corpus));
    WriteFileAtomically(out / "manifest.json", ManifestJson(catalogue, corpus, options, structure_set));
    std::filesystem::path cif_folder;
    if (*cif_option) {
      cif_folder = cif_dir.empty() ? out / "cif" : std::filesystem::path(cif_dir);
      WriteCifFolder(corpus, cif_folder);
    }
    const double seconds =
        std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();

    const CorpusSummary s = Summarise(catalogue, corpus);
    std::cout << "nucleate-corpus " << kGeneratorVersion << ": " << corpus.entries.size()
              << " structures from seed " << options.seed << " in " << seconds << " s\n"
              << "  " << s.per_type.size() << " structure types, " << s.per_crystal_system.size()
              << " crystal systems, " << s.per_element.size() << " elements, "
              << s.distinct_compositions << " distinct compositions, " << s.min_atoms << ".."
              << s.max_atoms << " atoms per cell\n"
              << "  " << corpus.dropped << " draws dropped by the validity checks\n"
              << "  wrote " << (out / structure_set).string() << " and "
              << (out / "manifest.json").string();
    if (!cif_folder.empty()) std::cout << ", CIF files in " << cif_folder.string();
    std::cout << "\n  synthetic structures: hypotheses, not measured crystals. Toxic elements "
                 "present: "
              << Join(s.toxic_elements) << "; radioactive: " << Join(s.radioactive_elements)
              << "\n";
    return 0;
  } catch (const std::exception& error) {
    std::cerr << "nucleate-corpus: " << error.what() << "\n";
    return kExitFailed;
  }
}
