// The Wasserstein-1 distance between two empirical distributions on the real line: how far the
// candidates' densities (or element counts) lie from the held-out set's, in the quantity's own
// units.
#pragma once

#include <vector>

namespace nucleate::assess {

// W1(P, Q) = integral over x of |F(x) - G(x)| dx, F and G the empirical cumulative distribution
// functions of `a` and `b` (each value weighted 1/n and 1/m). This is the standard definition of
// the 1-Wasserstein (earth mover's) distance between distributions on the real line, and the
// formula scipy.stats.wasserstein_distance documents and computes (tests/reference/assess
// compares the two).
//
// Computed exactly on the merged sorted values: between consecutive values both functions are
// constant, so the integral is the sum of (x_{k+1} - x_k) |i_k / n - j_k / m| with i_k, j_k the
// counts of a and b at or below x_k. The order of the inputs does not matter.
// InvalidArgument("a") / ("b") when one is empty or holds a value that is not finite.
double Wasserstein1(std::vector<double> a, std::vector<double> b);

}  // namespace nucleate::assess
