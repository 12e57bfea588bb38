#!/usr/bin/python3
"""Bench (not run by ctest): fitting 200 current-distance curves of 200 points each, tipgap's fit
against scipy.optimize.curve_fit on the same arrays, in one run (issue 14: tipgap >= 3x faster).
tipgap is timed twice: the library's fit_curve (build/tests/bench/fit_curves_bench, on the same
curves written to CSV files with 17 digits and read before timing), and through the Python module
(tipgap.fit on the NumPy arrays, which adds building the result dict: about 45 keys and the
φ_ap(z) profile as arrays).

The curves are synthetic (this script's own generator, not tipgap's): I = I0 exp(-2 kappa z) + white
noise, kappa = 10.9 /nm, I0 = 1 nA at z = 0, z from 0 to 0.5 nm, 2 pA noise, seeded. Pairs timed:

  tipgap fit --model linear   vs  curve_fit of the straight line ln|I| = a - 2 kappa z
                                   (the same model: a line through ln|I|)
  tipgap fit --model linear   vs  curve_fit of I0 exp(-2 kappa z) (what a SciPy user would write)
  tipgap fit (default offset) vs  curve_fit of I0 exp(-2 kappa z) + c (the same three parameters)

curve_fit gets the points above the noise floor tipgap selects (|I| > 5 sigma) for the line, and
all points for the exponentials, starting from the true values (its best case). tipgap's times
include what its result carries and curve_fit's do not (point selection, noise estimate, φ_ap(z)
profile, goodness of fit, intervals); the ratio is therefore conservative. Each figure is the best
of --repeat passes over all curves; per-curve CPU time (process time) and wall time are printed.

usage: PYTHONPATH=<build>/python /usr/bin/python3 tests/bench/fit_vs_curve_fit.py <build>/tests/bench/fit_curves_bench
       [--repeat N]
"""
import argparse
import json
import os
import subprocess
import tempfile
import time
import warnings

import numpy
from scipy.optimize import curve_fit

import tipgap

KAPPA_PER_NM = 10.9
NOISE_A = 2e-12
CURVES, POINTS = 200, 200


def make_curves(seed=14):
    rng = numpy.random.default_rng(seed)
    z = numpy.linspace(0.0, 0.5, POINTS)
    clean = 1e-9 * numpy.exp(-2.0 * KAPPA_PER_NM * z)
    return z, [clean + rng.normal(0.0, NOISE_A, POINTS) for _ in range(CURVES)]


def best_of(repeat, fn):
    best_cpu = best_wall = float("inf")
    for _ in range(repeat):
        w0, c0 = time.perf_counter(), time.process_time()
        fn()
        best_cpu = min(best_cpu, time.process_time() - c0)
        best_wall = min(best_wall, time.perf_counter() - w0)
    return best_cpu / CURVES, best_wall / CURVES


def library_rows(bench, z, curves):
    """fit_curve per curve from the C++ bench, on the same curves written as CSV (17 digits)."""
    unit = {"ns": 1e-9, "us": 1e-6, "ms": 1e-3}
    with tempfile.TemporaryDirectory() as tmp:
        for k, i in enumerate(curves):
            with open(os.path.join(tmp, f"curve_{k:03d}.csv"), "w") as fh:
                fh.write("# bias: 0.1 V\nz [nm],current [A]\n")
                fh.writelines(f"{a:.17g},{b:.17g}\n" for a, b in zip(z, i))
        out = subprocess.run([bench, f"--curves={tmp}", "--benchmark_format=json", "--benchmark_repetitions=3",
                              "--benchmark_report_aggregates_only=true"], check=True, capture_output=True, text=True)
    rows = []
    for b in json.loads(out.stdout)["benchmarks"]:
        if b.get("aggregate_name") == "mean":
            label = "library fit_curve, " + ("linear" if "linear" in b["run_name"] else "default offset")
            scale = unit[b["time_unit"]] / CURVES
            rows.append((label, (b["cpu_time"] * scale, b["real_time"] * scale)))
    return rows


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("bench", help="path of the fit_curves_bench program")
    ap.add_argument("--repeat", type=int, default=5)
    args = ap.parse_args()
    z, curves = make_curves()
    line = lambda x, a, slope: a + slope * x
    expo = lambda x, i0, k: i0 * numpy.exp(-2.0 * k * x)
    expo_c = lambda x, i0, k, c: i0 * numpy.exp(-2.0 * k * x) + c

    def tipgap_fit(model):
        return lambda: [tipgap.fit(z, i, 0.1, model=model) for i in curves]

    def scipy_line():
        for i in curves:
            keep = numpy.abs(i) > 5.0 * NOISE_A
            curve_fit(line, z[keep], numpy.log(numpy.abs(i[keep])), p0=(0.0, -2.0 * KAPPA_PER_NM))

    def scipy_expo(three):
        def run():
            for i in curves:
                if three:
                    curve_fit(expo_c, z, i * 1e9, p0=(1.0, KAPPA_PER_NM, 0.0))
                else:
                    curve_fit(expo, z, i * 1e9, p0=(1.0, KAPPA_PER_NM))
        return run

    # The same answer first: kappa of the first curve from both sides.
    k_tipgap = tipgap.fit(z, curves[0], 0.1, model="linear")["decay_constant_per_nm"]
    keep = numpy.abs(curves[0]) > 5.0 * NOISE_A
    k_scipy = -0.5 * curve_fit(line, z[keep], numpy.log(numpy.abs(curves[0][keep])))[0][1]
    print(f"load average {os.getloadavg()[0]:.2f}; {CURVES} curves of {POINTS} points; kappa of curve 0: "
          f"tipgap {k_tipgap:.4f} /nm, curve_fit {k_scipy:.4f} /nm")
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        rows = [
            ("tipgap fit --model linear", best_of(args.repeat, tipgap_fit("linear"))),
            ("tipgap fit (default offset model)", best_of(args.repeat, tipgap_fit("offset"))),
            ("curve_fit, line through ln|I|", best_of(args.repeat, scipy_line)),
            ("curve_fit, I0 exp(-2 kappa z)", best_of(args.repeat, scipy_expo(False))),
            ("curve_fit, I0 exp(-2 kappa z) + c", best_of(args.repeat, scipy_expo(True))),
        ]
    rows = library_rows(args.bench, z, curves) + rows
    print(f"{'per curve':36} {'CPU us':>9} {'wall us':>9}")
    for label, (cpu, wall) in rows:
        print(f"{label:36} {cpu * 1e6:9.1f} {wall * 1e6:9.1f}")
    t = dict(rows)
    for a, b in (("library fit_curve, linear", "curve_fit, line through ln|I|"),
                 ("library fit_curve, linear", "curve_fit, I0 exp(-2 kappa z)"),
                 ("library fit_curve, default offset", "curve_fit, I0 exp(-2 kappa z) + c"),
                 ("tipgap fit --model linear", "curve_fit, line through ln|I|"),
                 ("tipgap fit --model linear", "curve_fit, I0 exp(-2 kappa z)"),
                 ("tipgap fit (default offset model)", "curve_fit, I0 exp(-2 kappa z) + c")):
        print(f"{a} against {b}: {t[b][0] / t[a][0]:.2f}x faster (CPU), {t[b][1] / t[a][1]:.2f}x (wall)")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
