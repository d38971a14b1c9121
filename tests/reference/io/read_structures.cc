// Test driver for the io reference checks (io_reference.py): reads structure files with nucleate
// and prints what it read as JSON, or converts them to nucleate-written files for other readers.
//
//   read_structures read FILE...               JSON on stdout: every block / frame of every file
//   read_structures write-extxyz OUT FILE...   the structures read, as one multi-frame extxyz
//   read_structures write-cif OUT FILE...      the structures read, as P1 CIF blocks
//
// .cif files are read as CIF, anything else as extended XYZ.
#include <cstdio>
#include <string>
#include <vector>

#include "core/common/error.h"
#include "core/structure/io/cif_reader.h"
#include "core/structure/io/cif_writer.h"
#include "core/structure/io/extxyz.h"
#include "core/structure/io/text_file.h"
#include "core/structure/io/text_number.h"

namespace io = nucleate::structure::io;
using nucleate::structure::Crystal;

namespace {

struct Entry {
  std::string name;
  std::optional<Crystal> crystal;
  std::string error;
  std::vector<std::string> warnings;
};

bool EndsWith(const std::string& s, const std::string& suffix) {
  return s.size() >= suffix.size() && s.compare(s.size() - suffix.size(), suffix.size(), suffix) == 0;
}

std::vector<Entry> ReadAny(const std::string& path) {
  std::vector<Entry> out;
  if (EndsWith(path, ".cif")) {
    for (io::CifBlockResult& r : io::ReadCifFile(path)) {
      out.push_back({r.block_name, std::move(r.crystal), r.error ? r.error->what() : "",
                     std::move(r.warnings)});
    }
  } else {
    for (io::ExtxyzFrameResult& r : io::ReadExtxyzFile(path)) {
      out.push_back({"frame " + std::to_string(r.frame), std::move(r.crystal),
                     r.error ? r.error->what() : "", std::move(r.warnings)});
    }
  }
  return out;
}

std::string Quote(const std::string& s) {
  std::string out = "\"";
  for (char c : s) {
    if (c == '"' || c == '\\') {
      out += '\\';
      out += c;
    } else if (static_cast<unsigned char>(c) < 0x20) {
      char buffer[8];
      std::snprintf(buffer, sizeof(buffer), "\\u%04x", c);
      out += buffer;
    } else {
      out += c;
    }
  }
  return out + "\"";
}

std::string Number(double x) { return io::FormatShortest(x); }

std::string Json(const Entry& e) {
  std::string out = "{\"name\": " + Quote(e.name) + ", \"error\": " +
                    (e.error.empty() ? "null" : Quote(e.error)) + ", \"warnings\": [";
  for (std::size_t i = 0; i < e.warnings.size(); ++i) out += (i ? ", " : "") + Quote(e.warnings[i]);
  out += "]";
  if (e.crystal) {
    const Crystal& c = *e.crystal;
    out += ", \"label\": " + Quote(c.label) + ", \"lattice\": [";
    for (int r = 0; r < 3; ++r) {
      out += std::string(r ? ", " : "") + "[" + Number(c.lattice(r, 0)) + ", " + Number(c.lattice(r, 1)) +
             ", " + Number(c.lattice(r, 2)) + "]";
    }
    out += "], \"numbers\": [";
    for (std::size_t i = 0; i < c.size(); ++i) out += (i ? ", " : "") + std::to_string(c.numbers[i]);
    out += "], \"frac\": [";
    for (std::size_t i = 0; i < c.size(); ++i) {
      out += std::string(i ? ", " : "") + "[" + Number(c.frac[i][0]) + ", " + Number(c.frac[i][1]) +
             ", " + Number(c.frac[i][2]) + "]";
    }
    out += "], \"properties\": {";
    bool first = true;
    for (const auto& [key, value] : c.properties) {
      out += (first ? "" : ", ") + Quote(key) + ": " + Number(value);
      first = false;
    }
    out += "}";
  }
  return out + "}";
}

}  // namespace

int main(int argc, char** argv) {
  if (argc < 3) {
    std::fprintf(stderr, "usage: %s read FILE... | write-extxyz OUT FILE... | write-cif OUT FILE...\n",
                 argv[0]);
    return 2;
  }
  const std::string mode = argv[1];
  try {
    if (mode == "read") {
      std::string out = "[";
      for (int i = 2; i < argc; ++i) {
        out += std::string(i > 2 ? ",\n " : "") + "{\"file\": " + Quote(argv[i]) + ", \"blocks\": [";
        const std::vector<Entry> entries = ReadAny(argv[i]);
        for (std::size_t k = 0; k < entries.size(); ++k) out += (k ? ",\n  " : "") + Json(entries[k]);
        out += "]}";
      }
      std::fputs((out + "]\n").c_str(), stdout);
      return 0;
    }
    if ((mode == "write-extxyz" || mode == "write-cif") && argc >= 4) {
      std::vector<Crystal> crystals;
      for (int i = 3; i < argc; ++i) {
        for (Entry& e : ReadAny(argv[i])) {
          if (!e.crystal) {
            std::fprintf(stderr, "%s: %s\n", argv[i], e.error.c_str());
            return 1;
          }
          crystals.push_back(std::move(*e.crystal));
        }
      }
      std::string text;
      if (mode == "write-extxyz") {
        text = io::WriteExtxyz(crystals);
      } else {
        for (const Crystal& c : crystals) text += io::WriteCifP1(c);
      }
      io::WriteTextFile(argv[2], text);
      return 0;
    }
  } catch (const nucleate::Error& e) {
    std::fprintf(stderr, "%s\n", e.what());
    return 1;
  }
  std::fprintf(stderr, "unknown mode %s\n", mode.c_str());
  return 2;
}
