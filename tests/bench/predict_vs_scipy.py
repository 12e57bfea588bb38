#!/usr/bin/python3
"""Bench (not run by ctest): `tipgap predict` on a 100 x 100 (gap, bias) grid against the
straightforward SciPy reference of tests/crosscheck/model_scipy_check.py on a subset of the same
points, at the same relative tolerance. Prints per-point times and their ratio (target per J >= 1000x,
issue 14: per predicted point >= 5000x).

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
# J evaluations per predicted point. evaluate_point (lib/src/model/current_derivatives.cpp) runs
# one pass of the energy integral that yields J, dJ/ds and dJ/dV together (before issue 14: five
# J evaluations, J and its four neighbours). That pass costs about 1.2-1.3 plain J
# (build/tests/bench/model_bench: j_with_slopes_wkb_100mV against wkb_exact_4K_100mV); it is
# counted as one here, so "per J" below is per pass.
J_PER_POINT = 1


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
    # The reference splits the energy axis into 0.2 eV chunks so that quad's error estimate holds
    # at 1e-10; at a bench tolerance of 1e-6 the plain adaptive quad is enough (the printed
    # differences show it), which is the fair "straightforward SciPy" timing.
    ref.ENERGY_CHUNK_EV = 100.0 if args.tolerance >= 1e-7 else ref.ENERGY_CHUNK_EV

    with tempfile.TemporaryDirectory() as tmp:
        cfg = os.path.join(tmp, "bench.yaml")
        ref.write_config(cfg, TEMPERATURE_K, tolerance=False)
        with open(cfg, "a") as fh:
            fh.write(f"tolerance: {args.tolerance:g}\n")
        def timed(threads):
            cmd = [args.tipgap, "predict", "--config", cfg, "--gap", f"{GAP[0]}..{GAP[1]}",
                   f"--bias={BIAS[0]}..{BIAS[1]}", "--points", str(GRID), "--format", "json", "--threads", str(threads)]
            # Wall time, and the child's CPU time (user + sys): on a shared machine the CPU time is
            # the figure that other jobs disturb least.
            before = os.times()
            t0 = time.perf_counter()
            res = subprocess.run(cmd, capture_output=True, text=True)
            wall = time.perf_counter() - t0
            after = os.times()
            timed.cpu = (after.children_user - before.children_user) + (after.children_system - before.children_system)
            return res, wall

        res, t_predict = timed(1)
        if res.returncode != 0 and "tolerance" in res.stderr:
            ref.write_config(cfg, TEMPERATURE_K, tolerance=False)  # predict without the key: its default
            res, t_predict = timed(1)
        cpu_predict = timed.cpu
        if res.returncode != 0:
            print(f"tipgap predict failed (exit {res.returncode}): {res.stderr.strip()}")
            return 1
        _, t_all_cores = timed(0)
    points = json.loads(res.stdout)["points"]
    n = len(points)
    print(f"tipgap predict: {n} points ({GRID} x {GRID} grid, gap {GAP[0]}..{GAP[1]}, bias {BIAS[0]}..{BIAS[1]}, "
          f"{TEMPERATURE_K} K, exact image, tolerance {args.tolerance:g}), one process: {t_predict:.3f} s wall on "
          f"1 thread ({cpu_predict:.3f} s CPU; {t_all_cores:.3f} s on all cores) => {t_predict / n * 1e6:.1f} us/point "
          f"on one core "
          f"(includes start-up, YAML, JSON output and the derived quantities: {J_PER_POINT} J per point)")

    j = ref.Junction(ref.TIP[0], ref.TIP[1], ref.SAMPLE[0], ref.SAMPLE[1], K=1.0, image="exact")
    # A k x k sub-grid spread over both axes (k^2 >= subset).
    gaps = sorted({p["gap_nm"] for p in points})
    biases = sorted({p["bias_V"] for p in points})
    k = math.ceil(math.sqrt(args.subset))
    pick_g = {gaps[int((i + 0.5) * len(gaps) / k)] for i in range(k)}
    pick_b = {biases[int((i + 0.5) * len(biases) / k)] for i in range(k)}
    subset = [p for p in points if p["gap_nm"] in pick_g and p["bias_V"] in pick_b]
    times, cpu_times, worst = [], [], 0.0
    print(f"\nSciPy reference on {len(subset)} of the same points:")
    print(f"{'gap (nm)':>9} {'bias (V)':>9} {'J SciPy (A/m^2)':>22} {'J tipgap':>22} {'rel diff':>9} {'time (s)':>9}")
    warnings.simplefilter("ignore")
    for p in subset:
        t0, c0 = time.perf_counter(), time.process_time()
        J = ref.current_density(j, p["gap_nm"], p["bias_V"], TEMPERATURE_K)
        dt = time.perf_counter() - t0
        times.append(dt)
        cpu_times.append(time.process_time() - c0)
        got = p["current_density_A_per_m2"]
        rel = abs(got / J - 1.0) if J else math.inf
        worst = max(worst, rel)
        print(f"{p['gap_nm']:9.4f} {p['bias_V']:9.4f} {J:22.14e} {got:22.14e} {rel:9.2e} {dt:9.3f}")
    t_scipy = sum(times) / len(times)
    t_tip = t_predict / n
    cpu_scipy, cpu_tip = sum(cpu_times) / len(cpu_times), cpu_predict / n
    print(f"\nCPU time per point: tipgap predict {cpu_tip * 1e6:.1f} us, SciPy {cpu_scipy * 1e3:.1f} ms; ratio per point "
          f"{cpu_scipy / cpu_tip:.0f}x (the wall-clock figures follow)")
    print(f"\nper point: tipgap predict {t_tip * 1e6:.1f} us (one core, {J_PER_POINT} J each), SciPy {t_scipy * 1e3:.1f} ms "
          f"(one J); ratio per point {t_scipy / t_tip:.0f}x, per J evaluation {J_PER_POINT * t_scipy / t_tip:.0f}x "
          f"(targets: per J >= 1000x, per point >= 5000x); largest J difference on the subset {worst:.2e}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
