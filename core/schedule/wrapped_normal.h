// The wrapped normal distribution on the unit circle [0, 1): the law of frac(x0 + sigma * eps).
// Its density is a sum over integer images k of N(x + k; 0, sigma^2); we truncate the sum at
// |k| <= images and bound what the truncation leaves out.
#pragma once

namespace nucleate::schedule {

struct TruncationBound {
  int images = 0;                         // terms k = -images..images are summed
  double density_relative_error = 0;      // bound on |p_truncated - p| / p for every x
  double score_absolute_error = 0;        // bound on |score_truncated - score| for every x
};

// Bound for a given truncation; valid for any x (x is reduced to [-1/2, 1/2) first).
TruncationBound WrappedNormalTruncationBound(double sigma, int images);
// Smallest number of images whose density bound is at most `relative_tolerance`
// (1e-16 by default: exact to double precision).
int WrappedNormalImagesFor(double sigma, double relative_tolerance = 1e-16);

// Density on [0, 1) (integrates to 1 over one period) and its score d/dx log p.
double WrappedNormalDensity(double x, double sigma, int images);
double WrappedNormalScore(double x, double sigma, int images);

// Total-variation distance 1/2 * integral_0^1 |p(x) - 1| dx from the uniform distribution.
double WrappedNormalTvDistanceToUniform(double sigma);

}  // namespace nucleate::schedule
