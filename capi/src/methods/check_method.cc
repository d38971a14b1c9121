#include "methods/check_method.h"

#include <algorithm>
#include <cmath>
#include <limits>

#include "core/checks/validity.h"
#include "core/common/require.h"
#include "core/elements/elements.h"
#include "core/structure/composition.h"
#include "core/symmetry/symmetry.h"
#include "error_detail.h"
#include "methods/structure_inputs.h"
#include "methods/structure_report.h"
#include "methods/within_field.h"
#include "nucleate/v1/checks.pb.h"

namespace nucleate::capi {
namespace {

void HandleCheck(const v1::CheckRequest& request, v1::CheckReply* reply,
                 const CallContext& context) {
  const InputLimits limits = FromMessage(request.limits());
  const checks::ValidityThresholds thresholds = ThresholdsFromMessage(request.thresholds());
  const double symprec = request.has_symprec() ? request.symprec() : symmetry::kDefaultSymprec;
  RequirePositiveFinite("symprec", symprec);
  const double angle_tolerance =
      request.has_angle_tolerance() ? request.angle_tolerance() : symmetry::kDefaultAngleTolerance;
  RequireFinite("angle_tolerance", angle_tolerance);
  // Thresholds are checked once, before any structure, so a bad one refuses the whole request.
  WithinField("thresholds", [&] { checks::ValidateThresholds(thresholds); });

  std::vector<InputStructure> inputs = ReadInputs(request.inputs(), limits);
  v1::CheckSummary* summary = reply->mutable_summary();
  for (std::size_t i = 0; i < inputs.size(); ++i) {
    InputStructure& input = inputs[i];
    v1::StructureReport* report = reply->add_reports();
    report->set_source(input.source);
    report->set_index(static_cast<int>(i));
    for (const std::string& warning : input.warnings) report->add_warnings(warning);
    summary->set_structures(summary->structures() + 1);
    if (input.crystal) {
      try {
        CheckOne(*input.crystal, thresholds, limits, symprec, angle_tolerance, report);
        if (request.include_structures()) ToMessage(*input.crystal, report->mutable_structure());
      } catch (const Error& error) {
        // A limit the checks enforce (cell length, atom count) is named at the input.
        input.error = error.WithinField(input.field);
      }
    }
    if (input.error) {
      const std::string source = report->source();
      report->Clear();
      report->set_source(source);
      report->set_index(static_cast<int>(i));
      FillErrorDetail(*input.error, "Check", report->mutable_error());
      summary->set_unreadable(summary->unreadable() + 1);
    } else if (report->valid()) {
      summary->set_valid(summary->valid() + 1);
    } else {
      summary->set_invalid(summary->invalid() + 1);
    }
    if (!context.ReportProgress(static_cast<double>(i + 1) / inputs.size(), "check")) return;
  }
}

}  // namespace

MethodEntry CheckMethod() {
  return MakeMethod<v1::CheckRequest, v1::CheckReply, &HandleCheck>("Check");
}

}  // namespace nucleate::capi
