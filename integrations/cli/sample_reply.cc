#include "sample_reply.h"

#include <stdexcept>

#include "json_members.h"
#include "json_reply.h"

namespace nucleate::cli {

SampleResult ReadSampleReply(const std::string& reply_json) {
  const YAML::Node reply = ParseJson(reply_json);
  const std::vector<std::string> candidates = JsonArrayElements(reply_json, "candidates");
  if (candidates.size() != (reply["candidates"] ? reply["candidates"].size() : 0)) {
    throw std::runtime_error("the Sample reply's candidates could not be read");
  }
  SampleResult result;
  result.summary = reply["summary"];
  result.caution = reply["caution"].as<std::string>("");
  const YAML::Node groups = reply["groups"];
  for (std::size_t k = 0; k < candidates.size(); ++k) {
    const YAML::Node c = reply["candidates"][k];
    CandidateRow row;
    row.index = c["index"].as<std::uint32_t>(0);
    row.report = c["report"];
    if (row.report["error"] && row.report["error"]["message"]) {
      row.error = row.report["error"]["message"].as<std::string>();
    }
    row.group = c["group"].as<int>(0);
    row.representative = c["representative"].as<bool>(false);
    if (row.error.empty()) {
      const auto members = JsonObjectMembers(candidates[k]);
      row.structure_json = members.at("structure");
      const auto symmetrised = members.find("symmetrised");
      if (symmetrised != members.end() && symmetrised->second != "null") {
        row.symmetrised_json = symmetrised->second;
      }
      if (!row.representative && row.group >= 0 && groups &&
          static_cast<std::size_t>(row.group) < groups.size()) {
        row.duplicate_of = groups[row.group]["indices"][0].as<long long>();
      }
    }
    result.rows.push_back(std::move(row));
  }
  return result;
}

long long SummaryCount(const SampleResult& result, const char* field) {
  return result.summary && result.summary[field]
             ? static_cast<long long>(AsDouble(result.summary[field]))
             : 0;
}

}  // namespace nucleate::cli
