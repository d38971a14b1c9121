#include "methods/match_methods.h"

#include <string>
#include <vector>

#include "core/match/dedup.h"
#include "core/match/structure_matcher.h"
#include "error_detail.h"
#include "methods/structure_inputs.h"
#include "methods/within_field.h"
#include "nucleate/v1/match.pb.h"

namespace nucleate::capi {

match::MatchTolerances TolerancesFromMessage(const v1::MatchTolerances& m) {
  match::MatchTolerances t;  // core's defaults are the only defaults
  if (m.has_length_tolerance()) t.length_tolerance = m.length_tolerance();
  if (m.has_site_tolerance()) t.site_tolerance = m.site_tolerance();
  if (m.has_angle_tolerance()) t.angle_tolerance = m.angle_tolerance();
  if (m.has_primitive_cell()) t.primitive_cell = m.primitive_cell();
  if (m.has_scale_volume()) t.scale_volume = m.scale_volume();
  if (m.has_allow_supercell()) t.allow_supercell = m.allow_supercell();
  WithinField("tolerances", [&] { match::ValidateTolerances(t); });
  return t;
}

namespace {


void HandleMatch(const v1::MatchRequest& request, v1::MatchReply* reply, const CallContext&) {
  const InputLimits limits = FromMessage(request.limits());
  const match::MatchTolerances tolerances = TolerancesFromMessage(request.tolerances());
  const structure::Crystal a = ReadOneStructure(request.a(), limits, "a");
  const structure::Crystal b = ReadOneStructure(request.b(), limits, "b");
  const match::MatchResult result = match::MatchStructures(a, b, tolerances);
  reply->set_match(result.match);
  reply->set_rms(result.rms);
  reply->set_max_displacement(result.max_displacement);
  reply->set_reason(result.reason);
}

// Readable structures go to `crystals` with their sources; each unreadable one becomes an entry
// carrying its error.
void Collect(std::vector<InputStructure> read, std::vector<structure::Crystal>* crystals,
             std::vector<std::string>* sources, std::vector<v1::DedupEntry>* unreadable) {
  for (InputStructure& input : read) {
    if (input.error) {
      v1::DedupEntry entry;
      entry.set_source(input.source);
      FillErrorDetail(*input.error, "Dedup", entry.mutable_error());
      unreadable->push_back(std::move(entry));
    } else {
      sources->push_back(input.source);
      crystals->push_back(std::move(*input.crystal));
    }
  }
}

void HandleDedup(const v1::DedupRequest& request, v1::DedupReply* reply,
                 const CallContext& context) {
  const InputLimits limits = FromMessage(request.limits());
  const match::MatchTolerances tolerances = TolerancesFromMessage(request.tolerances());
  int threads = 0;  // all cores
  if (request.has_threads()) {
    if (request.threads() < 1) throw InvalidArgument("threads", "must be at least 1");
    threads = request.threads();
  }
  // Entries keep the request's order; unreadable ones carry their error and join no group.
  std::vector<InputStructure> read = ReadInputs(request.inputs(), limits);
  RequireValid(&read, limits.structure);
  std::vector<structure::Crystal> crystals;
  std::vector<int> entry_of_crystal;
  int unreadable = 0;
  for (std::size_t i = 0; i < read.size(); ++i) {
    v1::DedupEntry* entry = reply->add_entries();
    entry->set_source(read[i].source);
    entry->set_index(static_cast<int>(i));
    if (read[i].error) {
      FillErrorDetail(*read[i].error, "Dedup", entry->mutable_error());
      entry->set_group(-1);  // in no group
      ++unreadable;
    } else {
      entry_of_crystal.push_back(static_cast<int>(i));
      crystals.push_back(std::move(*read[i].crystal));
    }
  }
  std::vector<structure::Crystal> references;
  std::vector<std::string> reference_sources;
  std::vector<v1::DedupEntry> unreadable_references;
  std::vector<InputStructure> read_references = ReadInputs(request.references(), limits, "references");
  RequireValid(&read_references, limits.structure);
  Collect(std::move(read_references), &references, &reference_sources, &unreadable_references);
  for (v1::DedupEntry& entry : unreadable_references) {
    *reply->add_unreadable_references() = std::move(entry);
  }
  if (!context.ReportProgress(0.05, "read")) return;

  const match::DedupResult groups = match::Deduplicate(crystals, tolerances, threads);
  if (!context.ReportProgress(references.empty() ? 1.0 : 0.6, "dedup")) return;
  v1::DedupSummary* summary = reply->mutable_summary();
  summary->set_structures(reply->entries_size());
  summary->set_unreadable(unreadable);
  summary->set_unique(static_cast<int>(groups.groups.size()));
  summary->set_references(static_cast<int>(references.size()));
  for (std::size_t g = 0; g < groups.groups.size(); ++g) {
    v1::DedupGroup* group = reply->add_groups();
    for (int k : groups.groups[g]) {
      const int entry = entry_of_crystal[static_cast<std::size_t>(k)];
      group->add_members(entry);
      reply->mutable_entries(entry)->set_group(static_cast<int>(g));
      reply->mutable_entries(entry)->set_novel(true);
    }
    reply->mutable_entries(group->members(0))->set_representative(true);
  }

  // Novelty of each group's representative, shared by its members.
  if (!references.empty()) {
    std::vector<structure::Crystal> representatives;
    for (const auto& group : groups.groups) {
      representatives.push_back(crystals[static_cast<std::size_t>(group[0])]);
    }
    const match::NoveltyResult novelty =
        match::Novelty(representatives, references, tolerances, threads);
    for (std::size_t g = 0; g < groups.groups.size(); ++g) {
      if (novelty.novel[g] != 0) continue;
      const std::string& reference =
          reference_sources[static_cast<std::size_t>(novelty.reference[g])];
      for (int member : reply->groups(static_cast<int>(g)).members()) {
        reply->mutable_entries(member)->set_novel(false);
        reply->mutable_entries(member)->set_matched_reference(reference);
      }
    }
  }
  int novel_groups = 0;
  for (const v1::DedupGroup& group : reply->groups()) {
    if (reply->entries(group.members(0)).novel()) ++novel_groups;
  }
  summary->set_novel(novel_groups);
  context.ReportProgress(1.0, "novelty");
}

}  // namespace

MethodEntry MatchMethod() {
  return MakeMethod<v1::MatchRequest, v1::MatchReply, &HandleMatch>("Match");
}
MethodEntry DedupMethod() {
  return MakeMethod<v1::DedupRequest, v1::DedupReply, &HandleDedup>("Dedup");
}

}  // namespace nucleate::capi
