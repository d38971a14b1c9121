#include "core/structure/io/symmetry_operation.h"

#include <cctype>
#include <cmath>
#include <vector>

#include "core/common/error.h"
#include "core/structure/io/text_number.h"

namespace nucleate::structure::io {

namespace {

bool IsDigit(char c) { return c >= '0' && c <= '9'; }

// One of the three expressions: "-y+1/2", "x-y", "1/2+x", "+x". Returns false when garbled.
bool ParseComponent(std::string_view expr, Eigen::Vector3i& row, double& constant) {
  row.setZero();
  constant = 0;
  std::size_t i = 0;
  bool any_term = false;
  while (i < expr.size()) {
    int sign = 1;
    if (expr[i] == '+' || expr[i] == '-') {
      sign = expr[i] == '-' ? -1 : 1;
      ++i;
    } else if (any_term) {
      return false;  // terms after the first need an explicit sign
    }
    if (i >= expr.size()) return false;
    const char c = static_cast<char>(expr[i] | 0x20);  // lower case for letters
    if (c == 'x' || c == 'y' || c == 'z') {
      const int axis = c - 'x';
      if (row[axis] != 0) return false;  // "x+x" is not a symmetry operation
      row[axis] = sign;
      ++i;
    } else if (IsDigit(expr[i]) || expr[i] == '.') {
      std::size_t end = i;
      while (end < expr.size() && (IsDigit(expr[end]) || expr[end] == '.')) ++end;
      const std::optional<double> numerator = ParseDecimal(expr.substr(i, end - i));
      if (!numerator) return false;
      double value = *numerator;
      if (end < expr.size() && expr[end] == '/') {
        std::size_t d = end + 1;
        while (d < expr.size() && IsDigit(expr[d])) ++d;
        const std::optional<double> denominator = ParseDecimal(expr.substr(end + 1, d - end - 1));
        if (!denominator || *denominator == 0) return false;
        value /= *denominator;
        end = d;
      }
      // A coefficient written before a letter ("2x") is not an operation CIF files use.
      if (end < expr.size() && std::isalpha(static_cast<unsigned char>(expr[end]))) return false;
      constant += sign * value;
      i = end;
    } else {
      return false;
    }
    any_term = true;
  }
  return any_term;
}

}  // namespace

SymmetryOperation ParseSymmetryOperation(std::string_view text, const std::string& field) {
  std::string compact;
  for (char c : text) {
    if (c != ' ' && c != '\t') compact.push_back(c);
  }
  const auto fail = [&](const std::string& why) {
    return InvalidArgument(field, "symmetry operation '" + std::string(text) + "' " + why);
  };
  std::vector<std::string_view> parts;
  std::string_view rest(compact);
  while (true) {
    const std::size_t comma = rest.find(',');
    parts.push_back(rest.substr(0, comma));
    if (comma == std::string_view::npos) break;
    rest.remove_prefix(comma + 1);
  }
  if (parts.size() != 3) throw fail("does not have three comma-separated parts");
  SymmetryOperation op;
  for (int i = 0; i < 3; ++i) {
    Eigen::Vector3i row;
    double constant = 0;
    if (!ParseComponent(parts[i], row, constant)) {
      throw fail("has an unreadable part '" + std::string(parts[i]) + "'");
    }
    op.rotation.row(i) = row.transpose();
    op.translation[i] = constant;
  }
  const int det = op.rotation.determinant();
  if (det != 1 && det != -1) {
    throw fail("is not a crystallographic operation (determinant " + std::to_string(det) + ")");
  }
  return op;
}

namespace {

std::string FormatTranslation(double t) {
  t -= std::floor(t);
  if (t >= 1.0) t = 0;  // floor rounding of -1e-17
  for (int denominator = 2; denominator <= 12; ++denominator) {
    const double numerator = std::round(t * denominator);
    if (numerator > 0 && numerator < denominator && std::abs(t * denominator - numerator) < 1e-6 * denominator) {
      // Lowest terms come first because smaller denominators are tried first.
      return std::to_string(static_cast<int>(numerator)) + "/" + std::to_string(denominator);
    }
  }
  return FormatShortest(t);
}

}  // namespace

std::string FormatSymmetryOperation(const SymmetryOperation& op) {
  static const char kAxis[3] = {'x', 'y', 'z'};
  std::string out;
  for (int i = 0; i < 3; ++i) {
    if (i > 0) out += ", ";
    std::string part;
    for (int j = 0; j < 3; ++j) {
      const int r = op.rotation(i, j);
      if (r == 0) continue;
      if (r < 0) part += '-';
      else if (!part.empty()) part += '+';
      if (std::abs(r) != 1) part += std::to_string(std::abs(r));
      part += kAxis[j];
    }
    double t = op.translation[i] - std::floor(op.translation[i]);
    if (std::abs(t) > 1e-9 && std::abs(t - 1) > 1e-9) {
      if (!part.empty()) part += '+';
      part += FormatTranslation(t);
    }
    if (part.empty()) part = "0";
    out += part;
  }
  return out;
}

}  // namespace nucleate::structure::io
