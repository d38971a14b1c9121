#include "core/match/fingerprint.h"

#include <algorithm>
#include <cmath>
#include <limits>

#include "core/match/short_image.h"

namespace nucleate::match {
namespace {

constexpr double kRadiansPerDegree = 0.017453292519943295;

// Mean over each element's sites of the distance to the nearest other atom or own image.
std::vector<double> MeanNearestNeighbour(const PreparedCrystal& c) {
  const ShortImage image(c.lattice);
  const std::size_t n = c.size();
  std::vector<double> nearest(n, std::numeric_limits<double>::infinity());
  const double self = image.DistanceExcludingZero(Eigen::Vector3d::Zero());
  for (std::size_t i = 0; i < n; ++i) nearest[i] = self;
  for (std::size_t i = 0; i < n; ++i) {
    for (std::size_t j = i + 1; j < n; ++j) {
      const double d = image.Vector(c.frac[j] - c.frac[i]).norm();
      nearest[i] = std::min(nearest[i], d);
      nearest[j] = std::min(nearest[j], d);
    }
  }
  std::vector<double> means;
  for (const auto& [begin, end] : c.blocks) {
    double sum = 0;
    for (int i = begin; i < end; ++i) sum += nearest[i];
    means.push_back(sum / (end - begin));
  }
  return means;
}

}  // namespace

std::string FingerprintKey(const PreparedCrystal& c, const MatchTolerances& t) {
  return t.allow_supercell ? c.formula : c.formula + " / " + std::to_string(c.size());
}

Fingerprint ComputeFingerprint(const PreparedCrystal& c, const MatchTolerances& t) {
  Fingerprint f;
  f.key = FingerprintKey(c, t);
  const double n = static_cast<double>(c.size());
  if (!t.allow_supercell) {
    std::vector<double> minima;
    for (int k = 0; k < 3; ++k) minima.push_back(c.lattice.row(k).norm());
    std::sort(minima.begin(), minima.end());
    const double width = std::log(1 + t.length_tolerance) +
                         std::log(1 + 2 * std::sin(t.angle_tolerance * kRadiansPerDegree));
    for (double m : minima) {
      f.values.push_back(std::log(m));
      f.widths.push_back(width);
    }
  }
  if (!t.scale_volume) {
    f.values.push_back(std::log(c.volume / n));
    f.widths.push_back(3 * std::log(1 + t.length_tolerance) +
                       3 * t.angle_tolerance * kRadiansPerDegree);
  }
  const double unit = std::cbrt(c.volume / n);
  for (double mean : MeanNearestNeighbour(c)) {
    f.values.push_back(mean / unit);
    f.widths.push_back(2 * t.site_tolerance + t.length_tolerance / 2);
  }
  return f;
}

bool MayMatch(const Fingerprint& x, const Fingerprint& y) {
  if (x.key != y.key || x.values.size() != y.values.size()) return false;
  for (std::size_t k = 0; k < x.values.size(); ++k) {
    if (std::abs(x.values[k] - y.values[k]) > x.widths[k]) return false;
  }
  return true;
}

std::vector<long> GridCell(const Fingerprint& f, std::size_t dims) {
  std::vector<long> cell;
  for (std::size_t k = 0; k < dims && k < f.values.size(); ++k) {
    cell.push_back(static_cast<long>(std::floor(f.values[k] / f.widths[k])));
  }
  return cell;
}

}  // namespace nucleate::match
