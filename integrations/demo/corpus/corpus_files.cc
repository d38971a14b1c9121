#include "integrations/demo/corpus/corpus_files.h"

#include <cerrno>
#include <cstring>
#include <fstream>
#include <system_error>

#include <google/protobuf/io/coded_stream.h>
#include <google/protobuf/io/zero_copy_stream_impl_lite.h>

#include "core/common/error.h"
#include "core/structure/io/cif_writer.h"
#include "nucleate/v1/dataset.pb.h"

namespace nucleate::demo::corpus {
namespace {

Error IoError(const std::filesystem::path& path, const std::string& what) {
  return Error(ErrorKind::kIo, path.string(), what);
}

void ToMessage(const structure::Crystal& crystal, v1::Structure& message) {
  for (int r = 0; r < 3; ++r) {
    for (int c = 0; c < 3; ++c) message.add_lattice(crystal.lattice(r, c));
  }
  for (std::size_t k = 0; k < crystal.size(); ++k) {
    message.add_atomic_numbers(crystal.numbers[k]);
    for (int d = 0; d < 3; ++d) message.add_frac_coords(crystal.frac[k][d]);
  }
  message.set_label(crystal.label);
}

}  // namespace

std::string StructureSetBytes(const Corpus& corpus) {
  v1::StructureSet set;
  for (const CorpusEntry& entry : corpus.entries) ToMessage(entry.crystal, *set.add_structures());
  std::string bytes;
  {
    google::protobuf::io::StringOutputStream raw(&bytes);
    google::protobuf::io::CodedOutputStream coded(&raw);
    coded.SetSerializationDeterministic(true);
    if (!set.SerializeToCodedStream(&coded)) {
      throw Internal("the StructureSet could not be serialised");
    }
  }
  return bytes;
}

void WriteFileAtomically(const std::filesystem::path& path, const std::string& bytes) {
  std::filesystem::path temporary = path;
  temporary += ".partial";
  {
    std::ofstream out(temporary, std::ios::binary | std::ios::trunc);
    if (!out) throw IoError(temporary, std::string("cannot open for writing: ") + std::strerror(errno));
    out.write(bytes.data(), static_cast<std::streamsize>(bytes.size()));
    out.close();
    if (!out) throw IoError(temporary, std::string("write failed: ") + std::strerror(errno));
  }
  std::error_code error;
  std::filesystem::rename(temporary, path, error);
  if (error) throw IoError(path, "cannot rename " + temporary.string() + ": " + error.message());
}

void WriteCifFolder(const Corpus& corpus, const std::filesystem::path& folder) {
  std::error_code error;
  std::filesystem::create_directories(folder, error);
  if (error) throw IoError(folder, "cannot create the folder: " + error.message());
  for (const CorpusEntry& entry : corpus.entries) {
    const std::filesystem::path path = folder / (entry.crystal.label + ".cif");
    std::ofstream out(path, std::ios::binary | std::ios::trunc);
    out << structure::io::WriteCifP1(entry.crystal);
    out.close();
    if (!out) throw IoError(path, std::string("write failed: ") + std::strerror(errno));
  }
}

}  // namespace nucleate::demo::corpus
