#!/usr/bin/python3
"""nucleate's Wasserstein-1 distance (core/assess/wasserstein.h) against Debian's python3-scipy.

Usage: /usr/bin/python3 wasserstein_scipy_reference.py DUMP_WASSERSTEIN_BINARY SEED

scipy.stats.wasserstein_distance(u, v) computes the same quantity, the integral of |U - V| over
the empirical cumulative distribution functions. Cases: random samples of sizes 1 to 300 from
normal, uniform and heavy-tailed distributions (densities-like values and wide ranges), integer
samples with many ties (element counts per cell), shifted copies and equal samples; and refusals
(an empty side or a NaN / infinity) with the documented field.
"""

import os
import subprocess
import sys
import tempfile


def require(module, package):
    try:
        return __import__(module, fromlist=["_"])
    except ImportError as error:
        sys.stderr.write("%s cannot import %s (%s): apt-get install %s; this reference check does "
                         "not skip.\n" % (sys.executable, module, error, package))
        sys.exit(2)


np = require("numpy", "python3-numpy")
scipy_stats = require("scipy.stats", "python3-scipy")

# Both sum the same nonnegative terms in different orders (scipy: numpy's pairwise sum of
# products over the merged values; nucleate: a running sum); the largest relative difference
# measured on these cases is 2.0e-15 (seeds 7 and 20240602). 1e-12 leaves room without hiding a
# wrong formula (a wrong weight or an off-by-one in the step function changes the distance by far
# more, see the hand cases in tests/unit/assess/wasserstein_test.cc).
RELATIVE_TOLERANCE = 1e-12


def random_cases(rng):
    cases = []
    for _ in range(200):
        n, m = rng.integers(1, 301, size=2)
        kind = rng.integers(0, 4)
        if kind == 0:  # density-like values, g/cm3
            a, b = rng.normal(4.0, 1.5, n), rng.normal(4.3, 1.2, m)
        elif kind == 1:  # element counts per cell: small integers, many ties
            a, b = rng.integers(1, 6, n).astype(float), rng.integers(1, 6, m).astype(float)
        elif kind == 2:  # heavy tails, wide range
            a, b = rng.standard_cauchy(n) * 100, rng.standard_cauchy(m)
        else:  # uniform samples of very different scales
            a, b = rng.uniform(-1e-3, 1e-3, n), rng.uniform(0, 1e3, m)
        cases.append((a, b))
    base = rng.normal(0, 1, 50)
    cases.append((base, base + 2.5))  # a shift: the distance is the shift
    cases.append((base, rng.permutation(base)))  # the same sample: 0
    return cases


def main():
    if len(sys.argv) != 3:
        sys.stderr.write("usage: wasserstein_scipy_reference.py DUMP_WASSERSTEIN SEED\n")
        return 2
    dump, seed = sys.argv[1], int(sys.argv[2])
    rng = np.random.default_rng(seed)
    cases = random_cases(rng)
    refusals = [([], [1.0], "a"), ([1.0], [], "b"), ([1.0, float("nan")], [2.0], "a"),
                ([1.0], [float("inf")], "b")]
    with tempfile.NamedTemporaryFile("w", suffix=".txt", delete=False) as f:
        for a, b in cases:
            f.write("%d %d %s\n" % (len(a), len(b), " ".join(repr(float(x)) for x in list(a) + list(b))))
        for a, b, _ in refusals:
            f.write("%d %d %s\n" % (len(a), len(b), " ".join(repr(float(x)) for x in a + b)))
        path = f.name
    try:
        out = subprocess.run([dump, path], capture_output=True, text=True, check=True).stdout.split("\n")
    finally:
        os.unlink(path)

    failures = 0
    worst = 0.0
    for k, (a, b) in enumerate(cases):
        expected = scipy_stats.wasserstein_distance(a, b)
        status, value = out[k].split()
        got = float(value) if status == "ok" else float("nan")
        relative = abs(got - expected) / max(abs(expected), 1e-300)
        if expected == 0.0:
            relative = abs(got)
        worst = max(worst, relative)
        if not relative <= RELATIVE_TOLERANCE:
            failures += 1
            print("case %d (n=%d, m=%d): nucleate %r, scipy %r" % (k, len(a), len(b), got, expected))
    if abs(float(out[len(cases) - 2].split()[1]) - 2.5) > 1e-12:
        failures += 1
        print("the shifted copy is not 2.5 away: %s" % out[len(cases) - 2])
    for j, (_, _, field) in enumerate(refusals):
        line = out[len(cases) + j]
        if line != "error " + field:
            failures += 1
            print("refusal %d: expected 'error %s', got '%s'" % (j, field, line))
    print("%d cases against scipy.stats.wasserstein_distance (largest relative difference %.3g), "
          "%d refusals: %d failed" % (len(cases), worst, len(refusals), failures))
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main())
