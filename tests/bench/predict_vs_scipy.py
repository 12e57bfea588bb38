#!/usr/bin/python3
"""Bench (not run by ctest): `tipgap predict` on a 100 x 100 (gap, bias) grid against the
straightforward SciPy reference of tests/crosscheck/model_scipy_check.py on a subset of the same
points, at the same relative tolerance. Prints per-point times and their ratio (target >= 1000x).

usage: /usr/bin/python3 tests/bench/predict_vs_scipy.py <path-to-tipgap> [--subset N] [--tolerance T]
"""
import argparse
import json
import math
import os
import subprocess
import sys
import tempfile
import time
import warnings

HERE = os.path.dirname(os.path.abspath(__file__))
sys.path.insert(0, os.path.join(HERE, "..", "crosscheck"))
import model_scipy_check as ref  # noqa: E402  (the Task-B reference, reused as is)

GRID = 100
GAP = ("0.3nm", "2nm")
BIAS = ("-3V", "3V")
TEMPERATURE_K = 4.2


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("tipgap")
    ap.add_argument("--subset", type=int, default=25, help="SciPy points (>= 20)")
    ap.add_argument("--tolerance", type=float, default=1e-6, help="relative accuracy of J for both")
    args = ap.parse_args()

    # Same tolerance on the SciPy side: J to `tolerance` needs the WKB exponent (<= ~100 here)
    # to `tolerance` absolute, i.e. epsrel tolerance/100 on the exponent.
    ref.EPSREL_ENERGY = args.tolerance
    ref.EPSREL_WKB = max(args.tolerance / 100.0, 1e-13)

    with tempfile.TemporaryDirectory() as tmp:
        cfg = os.path.join(tmp, "bench.yaml")
        ref.write_config(cfg, TEMPERATURE_K, tolerance=False)
        with open(cfg, "a") as fh:
            fh.write(f"tolerance: {args.tolerance:g}\n")
        cmd = [args.tipgap, "predict", "--config", cfg, "--gap", f"{GAP[0]}..{GAP[1]}",
               f"--bias={BIAS[0]}..{BIAS[1]}", "--points", str(GRID), "--format", "json"]
        t0 = time.perf_counter()
        res = subprocess.run(cmd, capture_output=True, text=True)
        t_predict = time.perf_counter() - t0
        if res.returncode != 0 and "tolerance" in res.stderr:
            ref.write_config(cfg, TEMPERATURE_K, tolerance=False)  # predict without the key: its default
            t0 = time.perf_counter()
            res = subprocess.run(cmd, capture_output=True, text=True)
            t_predict = time.perf_counter() - t0
        if res.returncode != 0:
            print(f"tipgap predict failed (exit {res.returncode}): {res.stderr.strip()}")
            return 1
    points = json.loads(res.stdout)["points"]
    n = len(points)
    print(f"tipgap predict: {n} points ({GRID} x {GRID} grid, gap {GAP[0]}..{GAP[1]}, bias {BIAS[0]}..{BIAS[1]}, "
          f"{TEMPERATURE_K} K, exact image, tolerance {args.tolerance:g}) in {t_predict:.3f} s wall, one process "
          f"=> {t_predict / n * 1e6:.1f} us/point (includes start-up, YAML, JSON output and the derived "
          f"quantities of each point)")

    j = ref.Junction(ref.TIP[0], ref.TIP[1], ref.SAMPLE[0], ref.SAMPLE[1], K=1.0, image="exact")
    step = max(1, n // args.subset)
    subset = points[step // 2::step][: args.subset]
    times, worst = [], 0.0
    print(f"\nSciPy reference on {len(subset)} of the same points:")
    print(f"{'gap (nm)':>9} {'bias (V)':>9} {'J SciPy (A/m^2)':>22} {'J tipgap':>22} {'rel diff':>9} {'time (s)':>9}")
    warnings.simplefilter("ignore")
    for p in subset:
        t0 = time.perf_counter()
        J = ref.current_density(j, p["gap_nm"], p["bias_V"], TEMPERATURE_K)
        dt = time.perf_counter() - t0
        times.append(dt)
        got = p["current_density_A_per_m2"]
        rel = abs(got / J - 1.0) if J else math.inf
        worst = max(worst, rel)
        print(f"{p['gap_nm']:9.4f} {p['bias_V']:9.4f} {J:22.14e} {got:22.14e} {rel:9.2e} {dt:9.3f}")
    t_scipy = sum(times) / len(times)
    t_tip = t_predict / n
    print(f"\nper point: tipgap predict {t_tip * 1e6:.1f} us, SciPy {t_scipy * 1e3:.1f} ms; "
          f"ratio {t_scipy / t_tip:.0f}x (target >= 1000x); largest J difference on the subset {worst:.2e}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
