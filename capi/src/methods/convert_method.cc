#include "methods/convert_method.h"

#include "core/common/require.h"
#include "core/structure/io/cif_writer.h"
#include "core/structure/io/extxyz.h"
#include "core/symmetry/cif_setting.h"
#include "error_detail.h"
#include "methods/structure_inputs.h"
#include "nucleate/v1/convert.pb.h"

namespace nucleate::capi {
namespace {

void HandleConvert(const v1::ConvertRequest& request, v1::ConvertReply* reply,
                   const CallContext& context) {
  const InputLimits limits = FromMessage(request.limits());
  const double symprec = request.has_symprec() ? request.symprec() : symmetry::kDefaultSymprec;
  RequirePositiveFinite("symprec", symprec);
  switch (request.format()) {
    case v1::STRUCTURE_FORMAT_CIF:
    case v1::STRUCTURE_FORMAT_CIF_SYMMETRISED:
    case v1::STRUCTURE_FORMAT_EXTXYZ:
    case v1::STRUCTURE_FORMAT_JSON:
      break;
    default:
      throw InvalidArgument("format", "choose STRUCTURE_FORMAT_CIF, _CIF_SYMMETRISED, _EXTXYZ "
                                      "or _JSON");
  }
  std::vector<InputStructure> read = ReadInputs(request.inputs(), limits);
  // Writers and spglib assume a sane cell and real elements.
  RequireValid(&read, limits.structure);
  std::string text;
  for (std::size_t i = 0; i < read.size(); ++i) {
    InputStructure& input = read[i];
    if (input.crystal) {
      try {
        structure::Crystal& crystal = *input.crystal;
        if (crystal.label.empty()) crystal.label = input.source;
        switch (request.format()) {
          case v1::STRUCTURE_FORMAT_CIF:
            text += structure::io::WriteCifP1(crystal);
            break;
          case v1::STRUCTURE_FORMAT_CIF_SYMMETRISED:
            text += structure::io::WriteCifSymmetrized(
                symmetry::SymmetrisedForCif(crystal, symprec));
            break;
          case v1::STRUCTURE_FORMAT_EXTXYZ:
            text += structure::io::WriteExtxyzFrame(crystal);
            break;
          default:
            break;
        }
        ToMessage(crystal, reply->add_structures());
      } catch (const Error& error) {
        input.error = error;
      }
    }
    if (input.error) {
      v1::ConvertIssue* issue = reply->add_unreadable();
      issue->set_source(input.source);
      FillErrorDetail(*input.error, "Convert", issue->mutable_error());
    }
    if (!context.ReportProgress(static_cast<double>(i + 1) / read.size(), "convert")) break;
  }
  reply->set_text(text);
}

}  // namespace

MethodEntry ConvertMethod() {
  return MakeMethod<v1::ConvertRequest, v1::ConvertReply, &HandleConvert>("Convert");
}

}  // namespace nucleate::capi
