#!/usr/bin/python3
"""Independent numpy check of nucleate's noise-schedule tables and wrapped normal.

Usage: /usr/bin/python3 schedule_numpy_reference.py (DUMP_BINARY | DUMP.json)

Given the dump_schedule_tables binary it runs it; given a JSON file it reads it. Every quantity is
recomputed here from the published formulas, written naively but in numpy's long double (64-bit
mantissa on x86-64), so the cancellations the naive formulas suffer stay far below the tolerances.
Nothing here calls or mirrors nucleate's code. Exits non-zero with a message on any mismatch.

Run with Debian's /usr/bin/python3 and python3-numpy.
"""

import json
import math
import subprocess
import sys

try:
    import numpy as np
except ImportError:
    sys.stderr.write(
        "schedule_numpy_reference: numpy cannot be imported by %s. Install Debian's "
        "python3-numpy (apt-get install python3-numpy); this reference check does not skip.\n"
        % sys.executable)
    sys.exit(2)

LD = np.longdouble
PI = LD(4) * np.arctan(LD(1))  # pi to long double precision, not the double np.pi

TABLE_TOLERANCE = {
    # The task's contract: the linear and cosine tables agree to 1e-12 relative.
    "linear": 1e-12,
    "cosine": 1e-12,
    "linear_one_step": 1e-12,
}
# The other kinds and the transformed tables: also 1e-12 unless stated here.
DEFAULT_TOLERANCE = 1e-12
LOG_COLUMNS = {"log_snr", "posterior_log_variance_clipped"}
failures = []


def fail(message):
    failures.append(message)
    print("MISMATCH: " + message)


# ---------------------------------------------------------------------------------------------
# Schedules. Steps t = 1..T, alpha_bar_0 = 1.

def base_schedule(p):
    """Returns (beta[1..T], alpha_bar[0..T]) as long double arrays."""
    T = p["steps"]
    t = np.arange(1, T + 1, dtype=LD)
    kind = p["kind"]
    if kind == "linear":
        # Ho et al. 2020, sec. 4: beta linear in t from beta_start to beta_end.
        if T == 1:
            beta = np.full(1, LD(p["beta_start"]))
        else:
            beta = LD(p["beta_start"]) + (LD(p["beta_end"]) - LD(p["beta_start"])) * (t - 1) / (T - 1)
        return beta, np.concatenate(([LD(1)], np.cumprod(1 - beta)))
    if kind == "cosine":
        # Nichol and Dhariwal 2021, eq. 17, betas clipped at max_beta, alpha_bar their product.
        s = LD(p["cosine_offset"])
        tt = np.arange(0, T + 1, dtype=LD)
        f = np.cos((tt / T + s) / (1 + s) * PI / 2) ** 2
        beta = np.minimum(1 - f[1:] / f[:-1], LD(p["max_beta"]))
        return beta, np.concatenate(([LD(1)], np.cumprod(1 - beta)))
    if kind == "sigmoid":
        # Chen 2023, sigmoid schedule; betas from ratios, clipped, alpha_bar re-accumulated.
        start, end, tau = LD(p["sigmoid_start"]), LD(p["sigmoid_end"]), LD(p["sigmoid_tau"])
        sig = lambda x: 1 / (1 + np.exp(-x))
        u = np.arange(0, T + 1, dtype=LD) / T
        v_start, v_end = sig(start / tau), sig(end / tau)
        ab = (v_end - sig((u * (end - start) + start) / tau)) / (v_end - v_start)
        beta = np.minimum(1 - ab[1:] / ab[:-1], LD(p["max_beta"]))
        return beta, np.concatenate(([LD(1)], np.cumprod(1 - beta)))
    if kind == "log_snr_linear":
        u = np.arange(0, T + 1, dtype=LD) / T
        lam = LD(p["log_snr_max"]) + (LD(p["log_snr_min"]) - LD(p["log_snr_max"])) * u
        ab = 1 / (1 + np.exp(-lam))
        ab[0] = 1
        return 1 - ab[1:] / ab[:-1], ab
    raise ValueError("unknown kind " + kind)


def build_reference(p):
    beta, ab = base_schedule(p)
    T = p["steps"]
    with np.errstate(divide="ignore", invalid="ignore"):
        if p["log_snr_shift"] != 0:
            # Hoogeboom et al. 2023: log-SNR + shift.
            lam = np.log(ab[1:]) - np.log(1 - ab[1:]) + LD(p["log_snr_shift"])
            ab = np.concatenate(([LD(1)], 1 / (1 + np.exp(-lam))))
            beta = 1 - ab[1:] / ab[:-1]
        if p["zero_terminal_snr"]:
            # Lin et al. 2024, Algorithm 1, over steps 1..T.
            s = np.sqrt(ab[1:])
            s0, sT = s[0], s[-1]
            s = (s - sT) * s0 / (s0 - sT)
            ab = np.concatenate(([LD(1)], s * s))
            beta = 1 - ab[1:] / ab[:-1]
        source = np.arange(0, T + 1)
        n = p["respaced_steps"]
        if n not in (0, T):
            # Nichol and Dhariwal 2021, sec. 4: evenly spaced steps including T.
            source = np.concatenate(([0], np.floor(np.arange(1, n + 1) * T / n + 0.5).astype(int)))
            ab = ab[source]
            beta = 1 - ab[1:] / ab[:-1]
        a_prev, a = ab[:-1], ab[1:]
        alpha = 1 - beta
        cols = {
            "t": np.arange(1, len(a) + 1, dtype=LD),
            "source_t": source[1:].astype(LD),
            "beta": beta,
            "alpha": alpha,
            "alpha_bar": a,
            "sqrt_alpha_bar": np.sqrt(a),
            "sqrt_one_minus_alpha_bar": np.sqrt(1 - a),
            "snr": a / (1 - a),
            "log_snr": np.log(a) - np.log(1 - a),
            # Ho et al. 2020, eqs. 6-7.
            "posterior_variance": beta * (1 - a_prev) / (1 - a),
            "posterior_mean_coef_x0": beta * np.sqrt(a_prev) / (1 - a),
            "posterior_mean_coef_xt": (1 - a_prev) * np.sqrt(alpha) / (1 - a),
        }
        logvar = np.log(cols["posterior_variance"])
        logvar[0] = logvar[1] if len(a) > 1 else np.log(beta[0])
        cols["posterior_log_variance_clipped"] = logvar
    return cols


def _difference(g, r, col):
    if col in LOG_COLUMNS:
        # Logs compared absolutely, to tolerance * max(1, |x|).
        return np.abs(g - r) / np.maximum(1, np.abs(r))
    # Relative, with an absolute floor of 1e-300 for zeros.
    return np.abs(g - r) / np.maximum(np.maximum(np.abs(g), np.abs(r)), LD(1e-300))


def compare_tables(tables):
    for table in tables:
        name, p = table["name"], table["params"]
        tol = TABLE_TOLERANCE.get(name, DEFAULT_TOLERANCE)
        ref = build_reference(p)
        got = table["columns"]
        worst = []
        for col, ref_values in ref.items():
            if col not in got:
                fail("%s: column %s missing from the dump" % (name, col))
                continue
            g = np.array(got[col], dtype=LD)
            r = ref_values
            if g.shape != r.shape:
                fail("%s.%s: %d rows, reference has %d" % (name, col, g.size, r.size))
                continue
            same = (g == r)  # covers equal infinities
            with np.errstate(invalid="ignore"):
                diff = _difference(g, r, col)
            diff = np.where(same, 0, diff)
            diff = np.where(np.isnan(diff), np.inf, diff)
            m = float(np.max(diff))
            worst.append((col, m))
            if not m <= tol:
                i = int(np.argmax(diff))
                fail("%s.%s: max difference %.3g > %.0e at t=%d (nucleate %r, numpy %r)"
                     % (name, col, m, tol, i + 1, float(g[i]), float(r[i])))
        print("table %-34s (T=%d, tolerance %.0e): %s" % (
            name, len(got["t"]), tol, ", ".join("%s %.2g" % w for w in worst)))


# ---------------------------------------------------------------------------------------------
# Wrapped normal: own image sum, with its own choice of images (10 sigma + 3 either side).

def numpy_log_density(x, sigma):
    x = np.asarray(x, dtype=LD)
    s = LD(sigma)
    k_max = int(math.ceil(10 * sigma)) + 3
    ks = np.arange(-k_max, k_max + 1, dtype=LD)
    x0 = x - np.floor(x + LD(0.5))
    z = (x0[:, None] + ks[None, :]) / s
    e = -z * z / 2
    m = np.max(e, axis=1)
    return m + np.log(np.sum(np.exp(e - m[:, None]), axis=1)) - np.log(s * np.sqrt(2 * PI))


def check_wrapped_normal(cases):
    for case in cases:
        sigma, n = case["sigma"], case["grid_points"]
        x = (np.arange(n, dtype=LD) + LD(0.5)) / n
        got_density = np.array(case["density"], dtype=LD)
        got_score = np.array(case["score"], dtype=LD)
        ref_log = numpy_log_density(x, sigma)
        ref_density = np.exp(ref_log)

        # Integral over one period: midpoint rule, exact for a periodic analytic function up to
        # aliasing of order exp(-2 pi^2 (n sigma)^2) (Trefethen and Weideman 2014, SIAM Review).
        integral_nucleate = float(np.sum(got_density) / n)
        integral_numpy = float(np.sum(ref_density) / n)
        if not abs(integral_nucleate - 1) <= 1e-10:
            fail("sigma %g: nucleate density integrates to %.17g" % (sigma, integral_nucleate))
        if not abs(integral_numpy - 1) <= 1e-10:
            fail("sigma %g: numpy density integrates to %.17g" % (sigma, integral_numpy))

        # Pointwise density: relative to 1e-13 (1 + u), u = x^2 / (2 sigma^2), the conditioning of
        # exp(-u); points where the density is below 1e-280 are left out (underflow).
        x0 = x - np.floor(x + LD(0.5))
        u = x0 * x0 / (2 * LD(sigma) ** 2)
        live = ref_density > LD(1e-280)
        rel = np.abs(got_density - ref_density) / ref_density
        density_excess = np.max(np.where(live, rel / (1e-13 * (1 + u)), 0))
        max_density_rel = float(np.max(np.where(live, rel, 0)))
        if not density_excess <= 1:
            fail("sigma %g: density differs from numpy by %.3g relative" % (sigma, max_density_rel))

        # Score against a central difference of numpy's log density, h = 1e-5 sigma; error
        # measured relative to max(|score|, 1/sigma), the natural scale where the score passes 0.
        h = LD(1e-5) * LD(sigma)
        fd = (numpy_log_density(x + h, sigma) - numpy_log_density(x - h, sigma)) / (2 * h)
        scale = np.maximum(np.abs(got_score), 1 / LD(sigma))
        score_err = float(np.max(np.where(live, np.abs(got_score - fd) / scale, 0)))
        if not score_err <= 1e-6:
            fail("sigma %g: score differs from the numerical derivative by %.3g" % (sigma, score_err))
        print("wrapped normal sigma %-6g images %2d: integral-1 nucleate %+.2e numpy %+.2e, "
              "density max rel diff %.2e, score vs finite difference %.2e, bounds %.2e / %.2e"
              % (sigma, case["images"], integral_nucleate - 1, integral_numpy - 1,
                 max_density_rel, score_err, case["density_relative_error_bound"],
                 case["score_absolute_error_bound"]))


def numpy_tv(sigma):
    """1/2 integral_0^1 |p - 1| = integral_0^{1/2} |p - 1| (p is even), midpoint rule on 2^21
    points. p - 1 from the image sum for small sigma and from the Fourier series
    p - 1 = 2 sum_n exp(-2 pi^2 n^2 sigma^2) cos(2 pi n x) for sigma >= 0.3, where the series has
    no cancellation however small p - 1 becomes."""
    n = 1 << 21
    x = (np.arange(n, dtype=np.float64) + 0.5) / n * 0.5
    if sigma >= 0.3:
        diff = np.zeros(n)
        for k in range(1, 40):
            q = math.exp(-2 * math.pi ** 2 * k * k * sigma * sigma)
            if q < 1e-300:
                break
            diff += 2 * q * np.cos(2 * math.pi * k * x)
    else:
        p = np.zeros(n)
        for k in range(-3, 4):
            z = (x + k) / sigma
            p += np.exp(-0.5 * z * z)
        diff = p / (sigma * math.sqrt(2 * math.pi)) - 1
    return float(np.sum(np.abs(diff)) * 0.5 / n)


def check_tv(entries):
    worst = 0.0
    for e in entries:
        sigma, got = e["sigma"], e["tv"]
        ref = numpy_tv(sigma)
        rel = abs(got - ref) / max(abs(ref), 1e-300)
        worst = max(worst, rel)
        # The kink of |p - 1| limits the midpoint rule to O(h^2 p'): 1e-7 relative is ample.
        if not rel <= 1e-7:
            fail("TV at sigma %g: nucleate %.17g, numpy %.17g (rel %.3g)" % (sigma, got, ref, rel))
        print("TV sigma %-7g nucleate %.12e numpy %.12e rel diff %.2e" % (sigma, got, ref, rel))
    print("TV max relative difference %.2e" % worst)


def main():
    if len(sys.argv) != 2:
        sys.stderr.write(__doc__)
        return 2
    source = sys.argv[1]
    if source.endswith(".json"):
        with open(source) as f:
            dump = json.load(f)
    else:
        out = subprocess.run([source], check=True, stdout=subprocess.PIPE).stdout
        dump = json.loads(out)
    if dump.get("format") != "nucleate-schedule-dump-1":
        sys.stderr.write("unexpected dump format %r\n" % dump.get("format"))
        return 2
    compare_tables(dump["tables"])
    check_wrapped_normal(dump["wrapped_normal"])
    check_tv(dump["tv"])
    if failures:
        print("%d mismatches" % len(failures))
        return 1
    print("all schedule reference checks passed")
    return 0


if __name__ == "__main__":
    sys.exit(main())
