#include "error_detail.h"

#include <cctype>

#include "status.h"

namespace nucleate::capi {
namespace {

// File readers name their field "<file>:<line>" and the training configuration
// "<file>:<line>: <key path>"; either sets ErrorDetail.file and .line, so a caller can point at
// the line. Any other field leaves them empty. The first ":<digits>" that ends the field or is
// followed by ": " is taken, so a file name holding a colon ("a:1.cif:5") still splits right.
void SetFileAndLine(const std::string& field, v1::ErrorDetail* detail) {
  for (std::size_t colon = field.find(':'); colon != std::string::npos;
       colon = field.find(':', colon + 1)) {
    std::size_t end = colon + 1;
    long long line = 0;
    // Nine digits at most: a line number beyond int is no line of any file we read.
    while (end < field.size() && end - colon <= 9 &&
           std::isdigit(static_cast<unsigned char>(field[end]))) {
      line = line * 10 + (field[end] - '0');
      ++end;
    }
    const bool digits = end > colon + 1 &&
                        (end == field.size() || !std::isdigit(static_cast<unsigned char>(field[end])));
    const bool ends_here = end == field.size() || field.compare(end, 2, ": ") == 0;
    if (colon > 0 && digits && ends_here && line > 0) {
      detail->set_file(field.substr(0, colon));
      detail->set_line(static_cast<int>(line));
      return;
    }
  }
}

}  // namespace

std::string OneLine(const std::string& text) {
  static const char kHex[] = "0123456789abcdef";
  std::string out;
  bool space = false;
  for (char c : text) {
    const auto byte = static_cast<unsigned char>(c);
    if (c == '\n' || c == '\r' || c == '\t') {
      space = !out.empty();
      continue;
    }
    if (space && c != ' ') out += ' ';
    space = false;
    if (byte < 0x20 || byte == 0x7f) {
      // A NUL would cut the message short for C and Fortran callers; other control bytes garble
      // terminals. Quoted file content can hold any of them.
      out += "\\x";
      out += kHex[byte >> 4];
      out += kHex[byte & 15];
    } else {
      out += c;
    }
  }
  return out;
}

void FillErrorDetail(nucleate_status status, const std::string& message, const std::string& field,
                     const std::string& method, v1::ErrorDetail* detail) {
  detail->set_code(status);
  detail->set_status(nucleate_status_name(status));
  detail->set_message(OneLine(message));
  detail->set_field(field);
  detail->set_method(method);
  SetFileAndLine(field, detail);
}

void FillErrorDetail(const Error& error, const std::string& method, v1::ErrorDetail* detail) {
  FillErrorDetail(StatusForErrorKind(error.kind()), error.message(), error.field(), method, detail);
}

}  // namespace nucleate::capi
