// A SampleReply (protobuf JSON) read once into what the table, the summary file and the candidate
// files need, keeping each structure's JSON as the library wrote it.
#pragma once

#include <yaml-cpp/yaml.h>

#include <cstdint>
#include <string>
#include <vector>

namespace nucleate::cli {

struct CandidateRow {
  std::uint32_t index = 0;
  std::string error;             // the sample failed: why (the rest is empty)
  std::string structure_json;    // a Structure message, as in the reply
  std::string symmetrised_json;  // empty unless symmetrised (and a space group was found)
  YAML::Node report;             // the StructureReport
  int group = -1;                // duplicate group, -1 when failed
  bool representative = false;
  long long duplicate_of = -1;  // the group's representative when this is not it, else -1
  std::string file;             // written file names (in the out folder), set by the writer
  std::string symmetrised_file;
};

struct SampleResult {
  std::vector<CandidateRow> rows;  // ascending index
  YAML::Node summary;              // the SampleSummary
  std::string caution;             // candidates are hypotheses: shown wherever results are
};

SampleResult ReadSampleReply(const std::string& reply_json);

// A reply summary count (0 when the field is left out).
long long SummaryCount(const SampleResult& result, const char* field);

}  // namespace nucleate::cli
