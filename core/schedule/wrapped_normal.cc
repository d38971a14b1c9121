#include "core/schedule/wrapped_normal.h"

#include <algorithm>
#include <cmath>
#include <limits>
#include <string>

#include "core/common/error.h"
#include "core/common/shortest_number.h"

namespace nucleate::schedule {
namespace {

constexpr double kPi = 3.14159265358979323846;
constexpr double kLogSqrtTwoPi = 0.91893853320467274178;  // log(sqrt(2 pi))
// Below 1e-150 sigma^2 leaves the normal range of doubles; above 100 the distribution is uniform
// to far beyond double precision and the image sum would only cost time.
constexpr double kMinSigma = 1e-150;
constexpr double kMaxSigma = 100.0;
// sigma = 100 needs about 860 images for 1e-16; this cap only stops absurd requests.
constexpr int kMaxImages = 100000;
// From here up the Fourier series converges in a few terms and the TV integral is tiny, so it is
// computed from the series; below, the image sum with erfc gives the mass in closed form.
constexpr double kFourierSigma = 0.2;

void CheckSigma(double sigma) {
  if (!std::isfinite(sigma) || sigma < kMinSigma || sigma > kMaxSigma) {
    throw InvalidArgument("sigma",
                          "must be a finite number in [1e-150, 100], got " + FormatShortest(sigma));
  }
}

void CheckImages(int images) {
  if (images < 0) throw InvalidArgument("images", "must be >= 0");
  if (images > kMaxImages) {
    throw LimitExceeded("images", "at most " + std::to_string(kMaxImages) + " images");
  }
}

void CheckX(double x) {
  if (!std::isfinite(x)) throw InvalidArgument("x", "must be finite");
}

// The image sum relative to its largest term (k = 0, since |r| <= 1/2): nothing underflows to 0/0
// however small sigma is.
struct ImageSum {
  double log_largest_term;  // log of phi(r / sigma) / sigma
  double weight_sum;        // sum_k w_k, w_0 = 1
  double offset_sum;        // sum_k (r + k) w_k
};

ImageSum SumImages(double r, double sigma, int images) {
  const double inv_two_var = 0.5 / (sigma * sigma);
  double weight_sum = 0.0;
  double offset_sum = 0.0;
  // Smallest terms first; (r+k)^2 - r^2 = k (2r + k) is formed without cancellation.
  for (int k = images; k >= 1; --k) {
    const double kd = k;
    const double w_plus = std::exp(-kd * (kd + 2.0 * r) * inv_two_var);
    const double w_minus = std::exp(-kd * (kd - 2.0 * r) * inv_two_var);
    weight_sum += w_plus + w_minus;
    offset_sum += (r + kd) * w_plus + (r - kd) * w_minus;
  }
  weight_sum += 1.0;
  offset_sum += r;
  return {-r * r * inv_two_var - std::log(sigma) - kLogSqrtTwoPi, weight_sum, offset_sum};
}

double LogDensityReduced(double r, double sigma, int images) {
  const ImageSum s = SumImages(r, sigma, images);
  return s.log_largest_term + std::log(s.weight_sum);
}

double ScoreReduced(double r, double sigma, int images) {
  const ImageSum s = SumImages(r, sigma, images);
  return -(s.offset_sum / s.weight_sum) / (sigma * sigma);
}

// exp of a log bound; an upper bound that underflows is reported as the smallest positive double
// rather than 0, so it stays an upper bound.
double ExpBound(double log_bound) {
  const double b = std::exp(log_bound);
  return b > 0.0 ? b : std::numeric_limits<double>::denorm_min();
}

// Phi(b) - Phi(a) for a <= b, from erfc on the side where both tails are small, so the difference
// of two numbers close to 1 is never formed.
double NormalMass(double a, double b) {
  constexpr double kInvSqrt2 = 0.70710678118654752440;
  if (a >= 0.0) return 0.5 * (std::erfc(a * kInvSqrt2) - std::erfc(b * kInvSqrt2));
  if (b <= 0.0) return 0.5 * (std::erfc(-b * kInvSqrt2) - std::erfc(-a * kInvSqrt2));
  return 1.0 - 0.5 * (std::erfc(b * kInvSqrt2) + std::erfc(-a * kInvSqrt2));
}

// The density is symmetric and decreasing on [0, 1/2], so p - 1 changes sign once, at x*, and
// TV = integral over {p > 1} of (p - 1) = 2 (P(x*) - x*) with P(x) = integral_0^x p. TV does not
// move to first order in x* (its derivative there is p(x*) - 1 = 0), so a modest root is enough.
double TvByImages(double sigma) {
  const int images = WrappedNormalImagesFor(sigma);
  // Safeguarded Newton on log p(x) = 0, bracketed in (0, 1/2); the start is the root of the k = 0
  // term alone, which is close when sigma is small.
  double lo = 0.0, hi = 0.5;
  const double peak = -std::log(sigma) - kLogSqrtTwoPi;  // log of the k = 0 term at x = 0
  double x = std::min(sigma * std::sqrt(2.0 * std::max(peak, 0.0)), 0.45);
  for (int iter = 0; iter < 200; ++iter) {
    const double g = LogDensityReduced(x, sigma, images);
    if (g > 0.0)
      lo = x;
    else
      hi = x;
    const double slope = ScoreReduced(x, sigma, images);
    double next = slope < 0.0 ? x - g / slope : 0.5 * (lo + hi);
    if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
    const double step = std::fabs(next - x);
    x = next;
    if (step <= 1e-15 * std::max(x, sigma) || hi - lo <= 1e-16) break;
  }
  double mass = 0.0;  // P(x*): each image's share of [0, x*]
  for (int k = -images; k <= images; ++k) mass += NormalMass(k / sigma, (x + k) / sigma);
  return std::clamp(2.0 * (mass - x), 0.0, 1.0);
}

// p(x) = 1 + 2 sum_n q^(n^2) cos(2 pi n x), q = exp(-2 pi^2 sigma^2) (the Fourier series of the
// wrapped normal). Terms are scaled by q so the root is found even when q underflows.
double TvByFourier(double sigma) {
  const double c = 2.0 * kPi * kPi * sigma * sigma;
  double ratio[64];  // q_n / q_1 = exp(-c (n^2 - 1))
  int terms = 0;
  for (int n = 1; n <= 64; ++n) {
    ratio[n - 1] = std::exp(-c * (static_cast<double>(n) * n - 1.0));
    terms = n;
    if (ratio[n - 1] < 1e-20) break;
  }
  double lo = 0.0, hi = 0.5, x = 0.25;  // the root for one term
  for (int iter = 0; iter < 100; ++iter) {
    double h = 0.0, dh = 0.0;
    for (int n = 1; n <= terms; ++n) {
      h += ratio[n - 1] * std::cos(2.0 * kPi * n * x);
      dh -= 2.0 * kPi * n * ratio[n - 1] * std::sin(2.0 * kPi * n * x);
    }
    if (h > 0.0)
      lo = x;
    else
      hi = x;
    double next = dh < 0.0 ? x - h / dh : 0.5 * (lo + hi);
    if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
    const double step = std::fabs(next - x);
    x = next;
    if (step <= 1e-15 || hi - lo <= 1e-16) break;
  }
  // integral_0^x* (p - 1) = sum_n q_n sin(2 pi n x*) / (pi n), doubled for both halves.
  double sum = 0.0;
  for (int n = terms; n >= 1; --n) sum += ratio[n - 1] * std::sin(2.0 * kPi * n * x) / (kPi * n);
  return 2.0 * std::exp(-c) * sum;
}

}  // namespace

// Density: every omitted image (|k| > K) sits at distance >= a + j from x, j = 0, 1, ... on each
// side, a = K + 1/2. With e^{-(a+j)^2/(2 s^2)} <= e^{-a^2/(2 s^2)} q^j, q = e^{-a/s^2}, the omitted
// mass is E_D <= 2 phi(a/s)/s / (1 - q); the k = 0 term alone gives p >= phi(1/(2s))/s.
//
// Score S = N/D, N = -sum (r+k)/s^2 phi_k, D = sum phi_k. With the truncated S_K = N_K/D_K and
// omitted parts dN, dD:  S_K - S = (S_K dD - dN) / D,  so |S_K - S| <= (|S_K| E_D + E_N) / D.
// |S_K| <= a/s^2 (a weighted mean of |r+k|/s^2 over |k| <= K). For E_N the omitted term j has
// d e^{-d^2/(2s^2)} with d >= c = a + j; writing d = c + u, (c+u) e^{-cu/s^2} <= max(c, s^2/c)
// for u >= 0, so E_N <= 2/(s^3 sqrt(2 pi)) e^{-a^2/(2s^2)} [max(a, s^2/a)/(1-q) + q/(1-q)^2].
// Dividing by the lower bound of D gives the score bound below.
TruncationBound WrappedNormalTruncationBound(double sigma, int images) {
  CheckSigma(sigma);
  CheckImages(images);
  const double a = images + 0.5;
  const double var = sigma * sigma;
  const double one_minus_q = -std::expm1(-a / var);
  const double q = 1.0 - one_minus_q;
  const double log_gap = -(a * a - 0.25) / (2.0 * var);  // log(phi(a/s) / phi(1/(2s)))
  TruncationBound bound;
  bound.images = images;
  bound.density_relative_error = ExpBound(std::log(2.0) + log_gap - std::log(one_minus_q));
  const double bracket =
      a / one_minus_q + std::max(a, var / a) / one_minus_q + q / (one_minus_q * one_minus_q);
  bound.score_absolute_error = ExpBound(std::log(2.0 / var) + log_gap + std::log(bracket));
  return bound;
}

int WrappedNormalImagesFor(double sigma, double relative_tolerance) {
  CheckSigma(sigma);
  if (!std::isfinite(relative_tolerance) || relative_tolerance <= 0.0) {
    throw InvalidArgument("relative_tolerance", "must be a finite number > 0");
  }
  for (int images = 1; images <= kMaxImages; ++images) {
    if (WrappedNormalTruncationBound(sigma, images).density_relative_error <= relative_tolerance) {
      return images;
    }
  }
  throw LimitExceeded("images", "more than " + std::to_string(kMaxImages) +
                                    " images would be needed for this tolerance");
}

double WrappedNormalDensity(double x, double sigma, int images) {
  CheckX(x);
  CheckSigma(sigma);
  CheckImages(images);
  return std::exp(LogDensityReduced(std::remainder(x, 1.0), sigma, images));
}

double WrappedNormalScore(double x, double sigma, int images) {
  CheckX(x);
  CheckSigma(sigma);
  CheckImages(images);
  return ScoreReduced(std::remainder(x, 1.0), sigma, images);
}

double WrappedNormalTvDistanceToUniform(double sigma) {
  CheckSigma(sigma);
  return sigma < kFourierSigma ? TvByImages(sigma) : TvByFourier(sigma);
}

}  // namespace nucleate::schedule
