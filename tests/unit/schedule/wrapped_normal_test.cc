#include "core/schedule/wrapped_normal.h"

#include <gtest/gtest.h>

#include <cmath>
#include <limits>
#include <vector>

#include "core/common/error.h"

namespace nucleate::schedule {
namespace {

constexpr double kPi = 3.14159265358979323846;
constexpr double kEps = std::numeric_limits<double>::epsilon();
const std::vector<double> kSigmas = {0.005, 0.01, 0.05, 0.1, 0.3, 0.5, 1.0};

// Reference density: the defining image sum, written out naively in long double with 60 images
// either side (omitted mass < exp(-60^2 / 2) for sigma <= 1). Independent of the library's
// reduction, ordering and rescaling.
long double NaiveDensity(long double x, long double sigma, int images = 60) {
  long double sum = 0;
  for (int k = -images; k <= images; ++k) {
    const long double z = (x + k) / sigma;
    sum += std::exp(-0.5L * z * z);
  }
  return sum / (sigma * std::sqrt(2.0L * static_cast<long double>(kPi)));
}

long double NaiveScore(long double x, long double sigma, int images = 60) {
  long double num = 0, den = 0;
  for (int k = -images; k <= images; ++k) {
    const long double z = (x + k) / sigma;
    const long double w = std::exp(-0.5L * z * z);
    num -= (x + k) / (sigma * sigma) * w;
    den += w;
  }
  return num / den;
}

// Fourier series of the wrapped normal (Mardia and Jupp 2000, Directional Statistics, sec. 3.5.7,
// from memory): p(x) = 1 + 2 sum_n exp(-2 pi^2 n^2 sigma^2) cos(2 pi n x); converges fast for
// large sigma, and shares nothing with the image sum.
double FourierDensity(double x, double sigma, double* derivative = nullptr) {
  double p = 1.0, dp = 0.0;
  for (int n = 1; n <= 200; ++n) {
    const double q = std::exp(-2.0 * kPi * kPi * n * n * sigma * sigma);
    if (q < 1e-30) break;
    p += 2.0 * q * std::cos(2.0 * kPi * n * x);
    dp -= 4.0 * kPi * n * q * std::sin(2.0 * kPi * n * x);
  }
  if (derivative != nullptr) *derivative = dp;
  return p;
}

std::vector<double> SamplePoints() {
  std::vector<double> xs;
  for (int i = 0; i <= 100; ++i) xs.push_back(-0.5 + i / 100.0);
  xs.push_back(0.123456789);
  xs.push_back(-0.49999999);
  return xs;
}

TEST(WrappedNormalDensity, IntegratesToOne) {
  // The midpoint rule on a periodic analytic function converges geometrically (Trefethen and
  // Weideman 2014, SIAM Review 56, "The exponentially convergent trapezoidal rule", sec. 3): with
  // 4096 points and sigma >= 0.005 the aliasing error is below exp(-2 pi^2 (4096 sigma)^2).
  for (double sigma : kSigmas) {
    const int images = WrappedNormalImagesFor(sigma);
    const int n = 4096;
    double sum = 0.0;
    for (int i = 0; i < n; ++i) sum += WrappedNormalDensity((i + 0.5) / n, sigma, images);
    EXPECT_NEAR(sum / n, 1.0, 1e-10) << "sigma " << sigma;
  }
}

TEST(WrappedNormalDensity, MatchesNaiveImageSumAndFourierSeries) {
  for (double sigma : kSigmas) {
    const int images = WrappedNormalImagesFor(sigma);
    for (double x : SamplePoints()) {
      const long double ref = NaiveDensity(x, sigma);
      if (ref < 1e-250L) continue;  // far tail of tiny sigma: both underflow towards 0
      const double got = WrappedNormalDensity(x, sigma, images);
      // exp(-u) turns a rounding of u = r^2/(2 sigma^2) into a relative error of u eps: allow
      // 64 eps (1 + u) (conditioning of exp; common practice, no source).
      const double r = std::remainder(x, 1.0);
      const double tol = 64 * kEps * (1 + r * r / (2 * sigma * sigma));
      EXPECT_NEAR(got / static_cast<double>(ref), 1.0, tol) << sigma << " " << x;
      if (sigma >= 0.3) {
        EXPECT_NEAR(got / FourierDensity(x, sigma), 1.0, 64 * kEps) << sigma << " " << x;
      }
    }
  }
}

TEST(WrappedNormalDensity, ReducesModuloOne) {
  const int images = WrappedNormalImagesFor(0.1);
  EXPECT_NEAR(WrappedNormalDensity(0.3, 0.1, images), WrappedNormalDensity(7.3, 0.1, images),
              1e-13);
  EXPECT_NEAR(WrappedNormalDensity(0.3, 0.1, images), WrappedNormalDensity(-2.7, 0.1, images),
              1e-13);
}

TEST(WrappedNormalScore, MatchesCentralDifferencesOfLogDensity) {
  for (double sigma : kSigmas) {
    const int images = WrappedNormalImagesFor(sigma);
    const double h = 1e-4 * sigma;  // truncation ~ (h/sigma)^2, roundoff ~ eps / (h/sigma)
    for (double x : SamplePoints()) {
      if (NaiveDensity(x, sigma) < 1e-250L) continue;
      const double fd = (std::log(WrappedNormalDensity(x + h, sigma, images)) -
                         std::log(WrappedNormalDensity(x - h, sigma, images))) /
                        (2 * h);
      const double score = WrappedNormalScore(x, sigma, images);
      // Relative 1e-6, measured against the score's natural scale 1/sigma where it passes 0.
      const double scale = std::max(std::fabs(score), 1.0 / sigma);
      EXPECT_NEAR(score, fd, 1e-6 * scale) << sigma << " " << x;
    }
  }
}

TEST(WrappedNormalScore, MatchesNaiveImageSum) {
  for (double sigma : kSigmas) {
    const int images = WrappedNormalImagesFor(sigma);
    for (double x : SamplePoints()) {
      if (NaiveDensity(x, sigma) < 1e-250L) continue;
      const double ref = static_cast<double>(NaiveScore(x, sigma));
      EXPECT_NEAR(WrappedNormalScore(x, sigma, images), ref,
                  64 * kEps * std::max(std::fabs(ref), 1.0 / sigma))
          << sigma << " " << x;
    }
  }
}

TEST(WrappedNormalScore, StaysFiniteWhereTheDensityUnderflows) {
  // At sigma = 1e-4, x = 0.3 every image underflows (exp(-4.5e6)), but the k = 0 image dominates
  // the others by exp(-(0.7^2 - 0.3^2)/(2 sigma^2)), so the score is -x/sigma^2 (exact Gaussian).
  const double sigma = 1e-4;
  EXPECT_EQ(WrappedNormalDensity(0.3, sigma, 3), 0.0);
  EXPECT_NEAR(WrappedNormalScore(0.3, sigma, 3), -0.3 / (sigma * sigma),
              1e-12 * 0.3 / (sigma * sigma));
  // At the antipode the two nearest images balance: the score is 0 by symmetry.
  EXPECT_NEAR(WrappedNormalScore(0.5, 0.01, 3), 0.0, 1e-6);
}

// The truncated sums with few images against the reference: the measured error must stay under
// the stated bound (with room for rounding), for many x and sigma.
TEST(WrappedNormalTruncationBound, BoundsTheActualError) {
  int visible = 0;  // cases where truncation error is far above rounding, so the check bites
  for (double sigma : {0.05, 0.1, 0.2, 0.3, 0.5, 0.7, 1.0, 1.5}) {
    for (int images = 0; images <= 6; ++images) {
      const TruncationBound b = WrappedNormalTruncationBound(sigma, images);
      for (double x : SamplePoints()) {
        double dref = 0.0;
        const double ref = sigma >= 0.3 ? FourierDensity(x, sigma, &dref)
                                        : static_cast<double>(NaiveDensity(x, sigma));
        const double ref_score =
            sigma >= 0.3 ? dref / ref : static_cast<double>(NaiveScore(x, sigma));
        const double density_error = std::fabs(WrappedNormalDensity(x, sigma, images) / ref - 1.0);
        const double score_error = std::fabs(WrappedNormalScore(x, sigma, images) - ref_score);
        const double score_scale = std::max(std::fabs(ref_score), 1.0 / sigma);
        EXPECT_LE(density_error, b.density_relative_error + 64 * kEps)
            << "sigma " << sigma << " images " << images << " x " << x;
        EXPECT_LE(score_error, b.score_absolute_error + 64 * kEps * score_scale)
            << "sigma " << sigma << " images " << images << " x " << x;
        if (density_error > 1e-10) ++visible;
      }
    }
  }
  EXPECT_GT(visible, 100);
}

TEST(WrappedNormalTruncationBound, FormulaByHand) {
  // density bound 2 exp(-(a^2 - 1/4)/(2 s^2)) / (1 - exp(-a/s^2)), a = K + 1/2, evaluated here
  // directly: sigma = 0.5, K = 3 gives 2 e^{-24} / (1 - e^{-14}).
  const TruncationBound b = WrappedNormalTruncationBound(0.5, 3);
  EXPECT_EQ(b.images, 3);
  EXPECT_NEAR(b.density_relative_error / (2 * std::exp(-24.0) / (1 - std::exp(-14.0))), 1.0, 1e-14);
  EXPECT_GT(b.score_absolute_error, 0.0);
}

TEST(WrappedNormalImagesFor, HandfulOfImagesAtHalf) {
  // MODEL-NOTES: a handful of images either side is exact to double precision for sigma up to
  // about 0.5. From the bound by hand: K = 3 gives 2 e^{-24} = 7.6e-11, K = 4 gives
  // 2 e^{-40} = 8.5e-18 <= 1e-16, so K = 4.
  EXPECT_EQ(WrappedNormalImagesFor(0.5), 4);
  for (double sigma : kSigmas) {
    const int k = WrappedNormalImagesFor(sigma);
    EXPECT_GE(k, 1);
    EXPECT_LE(WrappedNormalTruncationBound(sigma, k).density_relative_error, 1e-16);
    if (k > 1) {
      EXPECT_GT(WrappedNormalTruncationBound(sigma, k - 1).density_relative_error, 1e-16);
    }
  }
  // Looser tolerances need no more images.
  EXPECT_LE(WrappedNormalImagesFor(1.0, 1e-8), WrappedNormalImagesFor(1.0));
}

TEST(WrappedNormalTv, LeadingFourierTermForLargeSigma) {
  // p - 1 ~ 2 q cos(2 pi x), q = exp(-2 pi^2 sigma^2), so TV ~ (1/2) integral |2 q cos| = 2q/pi;
  // the next term changes it by O(q^3) relative.
  for (double sigma : {0.4, 0.5, 1.0, 2.0}) {
    const double q = std::exp(-2 * kPi * kPi * sigma * sigma);
    EXPECT_NEAR(WrappedNormalTvDistanceToUniform(sigma) / (2 * q / kPi), 1.0, 1e-3) << sigma;
  }
}

TEST(WrappedNormalTv, SmallSigmaAsymptotics) {
  // For tiny sigma only the k = 0 image matters: p(x*) = 1 at z* = x*/sigma =
  // sqrt(2 ln(1/(sigma sqrt(2 pi)))), and TV = 1 - 2 x* - 2 (1 - Phi(z*)). With the Mills ratio
  // 1 - Phi(z) = phi(z)/z (1 - 1/z^2 + ...) and phi(z*) = sigma:
  // 1 - TV = 2 sigma (z* + 1/z* - 1/z*^3 + O(z*^-5)) (Abramowitz and Stegun 26.2.12).
  for (double sigma : {1e-4, 1e-3}) {
    const double z = std::sqrt(2 * std::log(1 / (sigma * std::sqrt(2 * kPi))));
    const double expected = 2 * sigma * (z + 1 / z - 1 / (z * z * z));
    EXPECT_NEAR((1 - WrappedNormalTvDistanceToUniform(sigma)) / expected, 1.0, 3 / std::pow(z, 5))
        << sigma;
  }
}

// TV by brute force: midpoint rule for integral_0^{1/2} |p - 1| (which is the TV by symmetry),
// with the naive density. The kink at p = 1 limits it to O(h^2 p'), below 1e-9 here.
double BruteForceTv(double sigma) {
  const int n = 1 << 19;
  double sum = 0.0;
  for (int i = 0; i < n; ++i) {
    const double x = 0.5 * (i + 0.5) / n;
    double p = 0.0;
    for (int k = -8; k <= 8; ++k) {
      const double z = (x + k) / sigma;
      p += std::exp(-0.5 * z * z);
    }
    sum += std::fabs(p / (sigma * std::sqrt(2 * kPi)) - 1.0);
  }
  return 0.5 * sum / n;
}

TEST(WrappedNormalTv, MatchesBruteForceQuadrature) {
  for (double sigma : {1e-3, 0.005, 0.05, 0.1, 0.15, 0.199, 0.2, 0.25, 0.3, 0.5}) {
    EXPECT_NEAR(WrappedNormalTvDistanceToUniform(sigma), BruteForceTv(sigma), 1e-8) << sigma;
  }
}

TEST(WrappedNormalTv, ContinuousAcrossTheMethodSwitchAndDecreasing) {
  // Below 0.2 the image sum is used, from 0.2 the Fourier series: they must agree where they meet.
  const double below = WrappedNormalTvDistanceToUniform(std::nextafter(0.2, 0.0));
  const double at = WrappedNormalTvDistanceToUniform(0.2);
  EXPECT_NEAR(below, at, 1e-13);
  double previous = 1.0;
  for (double sigma = 1e-4; sigma < 3; sigma *= 1.05) {
    const double tv = WrappedNormalTvDistanceToUniform(sigma);
    EXPECT_LT(tv, previous) << sigma;  // convolution with a wrapped normal contracts TV
    EXPECT_GE(tv, 0.0);
    previous = tv;
  }
}

TEST(WrappedNormalValidation, NamesTheField) {
  auto field_of = [](auto&& call) {
    try {
      call();
    } catch (const Error& e) {
      EXPECT_EQ(e.kind() == ErrorKind::kInvalidArgument || e.kind() == ErrorKind::kLimitExceeded,
                true);
      return e.field();
    }
    return std::string("no error");
  };
  const double nan = std::numeric_limits<double>::quiet_NaN();
  const double inf = std::numeric_limits<double>::infinity();
  EXPECT_EQ(field_of([&] { WrappedNormalDensity(0.1, nan, 3); }), "sigma");
  EXPECT_EQ(field_of([&] { WrappedNormalDensity(0.1, -0.1, 3); }), "sigma");
  EXPECT_EQ(field_of([&] { WrappedNormalDensity(0.1, 0.0, 3); }), "sigma");
  EXPECT_EQ(field_of([&] { WrappedNormalScore(0.1, inf, 3); }), "sigma");
  EXPECT_EQ(field_of([&] { WrappedNormalDensity(nan, 0.1, 3); }), "x");
  EXPECT_EQ(field_of([&] { WrappedNormalScore(inf, 0.1, 3); }), "x");
  EXPECT_EQ(field_of([&] { WrappedNormalDensity(0.1, 0.1, -1); }), "images");
  EXPECT_EQ(field_of([&] { WrappedNormalTruncationBound(0.1, -1); }), "images");
  EXPECT_EQ(field_of([&] { WrappedNormalImagesFor(0.1, 0.0); }), "relative_tolerance");
  EXPECT_EQ(field_of([&] { WrappedNormalImagesFor(0.1, nan); }), "relative_tolerance");
  EXPECT_EQ(field_of([&] { WrappedNormalTvDistanceToUniform(-1.0); }), "sigma");
}

}  // namespace
}  // namespace nucleate::schedule
