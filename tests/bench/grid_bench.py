#!/usr/bin/python3
"""Grid benchmark: `tipgap map` against a NumPy/SciPy baseline on the same synthetic grid.

Run by hand (not by ctest), from the source tree after a Release build:
    /usr/bin/python3 tests/bench/grid_bench.py [--tipgap build/cli/tipgap] [--workdir /tmp/tipgap_bench]
        [--repeat 3] [--no-scaling] [--no-baseline]

1. Writes a seeded 256 x 256 x 128 grid with `tipgap synth --grid 256x256 --pitch 1nm
   --points-per-curve 128 --pattern disc --noise 1pA --seed 7` (synthetic; --python-synth uses
   tests/bench/grid_synth.py instead) and reads it once so that it is in the page cache for every
   contender.
2. Times `tipgap map GRID --threads 2 --quiet` under /usr/bin/time -v (wall time, peak RSS), --repeat
   times; reports MB/s end to end (whole command: parse, fit, every output file), fitted samples
   per second and the read+fit time from summary.json.
3. Times the baseline in a child process under /usr/bin/time -v: numpy.loadtxt of the same file,
   then per pixel the same selection (tail noise estimate, 3 sigma floor) and a weighted
   numpy.polyfit of ln|I| (weights |I|/sigma), one reweighted pass; compares the two barrier maps.
4. Scaling: cost against grid size, curve length and thread count.
Prints the conditions (cores, load average) with the figures: the machine may be shared.
"""
import argparse
import json
import math
import os
import re
import statistics
import subprocess
import sys
import time

HERE = os.path.dirname(os.path.abspath(__file__))
HBAR = 6.62607015e-34 / (2 * math.pi)  # CODATA 2018
ME = 9.1093837015e-31
EV = 1.602176634e-19


SYNTH = {"exe": None, "python": False}


def synth(path, nx, ny, points, seed=7):
    """The grid from `tipgap synth --grid` (seeded, 1 pA noise, disc pattern; truth YAML beside it),
    or with --python-synth from tests/bench/grid_synth.py."""
    if not os.path.exists(path):
        if SYNTH["python"]:
            cmd = [sys.executable, os.path.join(HERE, "grid_synth.py"), path, "--nx", str(nx), "--ny", str(ny),
                   "--points", str(points), "--seed", str(seed), "--pattern", "disc"]
        else:
            cmd = [SYNTH["exe"], "synth", "--grid", f"{nx}x{ny}", "--pitch", "1nm", "--points-per-curve", str(points),
                   "--pattern", "disc", "--noise", "1pA", "--seed", str(seed), "--out", path]
        subprocess.run(cmd, check=True, stdout=subprocess.DEVNULL)
    with open(path, "rb") as f:  # into the page cache
        while f.read(1 << 24):
            pass
    return os.path.getsize(path)


def timed(cmd):
    """Runs cmd under /usr/bin/time -v; returns (wall s, peak RSS MB, user s, sys s, stdout)."""
    r = subprocess.run(["/usr/bin/time", "-v"] + cmd, capture_output=True, text=True)
    if r.returncode != 0:
        sys.exit(f"failed: {' '.join(cmd)}\n{r.stderr}")
    def field(name):
        return re.search(rf"{re.escape(name)}: (.*)", r.stderr).group(1).strip()
    wall = field("Elapsed (wall clock) time (h:mm:ss or m:ss)")
    parts = [float(p) for p in wall.split(":")]
    secs = sum(p * 60 ** (len(parts) - 1 - k) for k, p in enumerate(parts))
    return (secs, int(field("Maximum resident set size (kbytes)")) / 1024.0, float(field("User time (seconds)")),
            float(field("System time (seconds)")), r.stdout)


def run_map(exe, grid, out, threads):
    wall, rss, user, sys_s, _ = timed([exe, "map", grid, "--output-dir", out, "--threads", str(threads), "--quiet"])
    summary = json.load(open(os.path.join(out, "summary.json")))
    return {"wall": wall, "rss": rss, "cpu": user + sys_s, "read_fit": summary["timings"]["read_and_fit_s"],
            "samples": summary["grid"]["samples"], "bytes": summary["grid"]["bytes"]}


# ---------------------------------------------------------------------------------------------
# The baseline, run in a child process (python3 grid_bench.py --baseline GRID OUT.npy).
def baseline(grid, out):
    import numpy as np
    t0 = time.perf_counter()
    # The header row is not a comment: skip it by counting the '#' lines first.
    skip = 0
    with open(grid) as f:
        for line in f:
            if line.startswith("#"):
                skip += 1
                continue
            skip += 1  # the header
            break
    data = np.loadtxt(grid, delimiter=",", skiprows=skip)
    t1 = time.perf_counter()
    x, y, z, cur = data[:, 0], data[:, 1], data[:, 2] * 1e-9, data[:, 3] * 1e-12
    # Pixels: runs of equal (x, y).
    change = np.flatnonzero((np.diff(x) != 0) | (np.diff(y) != 0)) + 1
    starts = np.concatenate(([0], change))
    ends = np.concatenate((change, [len(x)]))
    xs, ys = np.unique(x), np.unique(y)
    phi = np.full((len(ys), len(xs)), np.nan)
    for s, e in zip(starts, ends):
        zz, ii = z[s:e], cur[s:e]
        order = np.argsort(zz, kind="stable")
        zz, ii = zz[order], ii[order]
        a = np.abs(ii)
        n = len(zz)
        tail_n = min(max(8, n // 5), max(n // 2, 3), n)
        tail = ii[::-1][:tail_n]
        d = np.diff(tail)
        sigma = 1.482602218505602 * np.median(np.abs(d - np.median(d))) / math.sqrt(2)
        med = np.median(tail)
        flat = 1.482602218505602 * np.median(np.abs(tail - med)) < 2 * sigma
        floor = 3 * sigma + (abs(med) if flat else 0.0)
        sel = a >= floor
        if sel.sum() < 3:
            continue
        c = np.polyfit(zz[sel], np.log(a[sel]), 1, w=a[sel] / sigma)
        fitted = np.exp(np.polyval(c, zz))
        sel = (fitted >= floor) & (a >= floor / 3)
        if sel.sum() >= 3:
            c = np.polyfit(zz[sel], np.log(a[sel]), 1, w=fitted[sel] / sigma)
        kappa = -0.5 * c[0]
        phi[np.searchsorted(ys, y[s]), np.searchsorted(xs, x[s])] = HBAR ** 2 * kappa ** 2 / (2 * ME) / EV
    t2 = time.perf_counter()
    np.save(out, phi)
    print(json.dumps({"parse_s": t1 - t0, "fit_s": t2 - t1}))


def run_baseline(grid, out_npy):
    wall, rss, user, sys_s, stdout = timed([sys.executable, os.path.abspath(__file__), "--baseline", grid, out_npy])
    parts = json.loads(stdout.strip().splitlines()[-1])
    return {"wall": wall, "rss": rss, "cpu": user + sys_s, **parts}


# ---------------------------------------------------------------------------------------------
def conditions():
    load = os.getloadavg()
    cpu = "unknown"
    try:
        for line in open("/proc/cpuinfo"):
            if line.startswith("model name"):
                cpu = line.split(":", 1)[1].strip()
                break
    except OSError:
        pass
    return f"{os.cpu_count()} cores ({cpu}), load average {load[0]:.2f} {load[1]:.2f} {load[2]:.2f}"


def main():
    if len(sys.argv) == 4 and sys.argv[1] == "--baseline":
        baseline(sys.argv[2], sys.argv[3])
        return
    ap = argparse.ArgumentParser()
    ap.add_argument("--tipgap", default=os.path.join(HERE, "..", "..", "build", "cli", "tipgap"))
    ap.add_argument("--workdir", default="/tmp/tipgap_grid_bench")
    ap.add_argument("--repeat", type=int, default=3)
    ap.add_argument("--no-baseline", action="store_true")
    ap.add_argument("--no-scaling", action="store_true")
    ap.add_argument("--python-synth", action="store_true", help="make the grids with grid_synth.py instead of tipgap synth")
    a = ap.parse_args()
    exe = os.path.abspath(a.tipgap)
    SYNTH["exe"], SYNTH["python"] = exe, a.python_synth
    os.makedirs(a.workdir, exist_ok=True)
    print(f"conditions at start: {conditions()}")
    grid = os.path.join(a.workdir, "synth_256x256x128.csv" if not a.python_synth else "grid_256x256x128.csv")
    size = synth(grid, 256, 256, 128)
    print(f"grid: {grid}, {size / 1e6:.1f} MB, 256 x 256 pixels x 128 samples (synthetic)")

    runs = [run_map(exe, grid, os.path.join(a.workdir, "map"), 2) for _ in range(a.repeat)]
    best = min(runs, key=lambda r: r["wall"])
    med_wall = statistics.median(r["wall"] for r in runs)
    walls = ", ".join("%.2f" % r["wall"] for r in runs)
    print(f"\ntipgap map --threads 2, {a.repeat} runs: wall {walls} s "
          f"(best {best['wall']:.2f}, median {med_wall:.2f})")
    print(f"  end to end: {size / 1e6 / best['wall']:.0f} MB/s best, {size / 1e6 / med_wall:.0f} MB/s median "
          f"(target >= 400, aim 1000)")
    print(f"  read + fit only (summary.json): {min(r['read_fit'] for r in runs):.2f} s = "
          f"{size / 1e6 / min(r['read_fit'] for r in runs):.0f} MB/s")
    print(f"  fitted samples per second: {best['samples'] / best['wall'] / 1e6:.1f} M end to end")
    print(f"  CPU time (user + sys): {best['cpu']:.2f} s; peak RSS {max(r['rss'] for r in runs):.1f} MB (target < 100)")

    if not a.no_baseline:
        b = run_baseline(grid, os.path.join(a.workdir, "baseline_phi.npy"))
        print(f"\nNumPy baseline (numpy.loadtxt + weighted numpy.polyfit per pixel): wall {b['wall']:.1f} s "
              f"(parse {b['parse_s']:.1f} s, fits {b['fit_s']:.1f} s), peak RSS {b['rss']:.0f} MB")
        print(f"  {size / 1e6 / b['wall']:.1f} MB/s, {best['samples'] / b['wall'] / 1e6:.2f} M samples/s")
        print(f"  ratio tipgap / baseline: {b['wall'] / best['wall']:.0f}x faster end to end (target >= 10x)")
        import numpy as np
        phi_b = np.load(os.path.join(a.workdir, "baseline_phi.npy"))
        phi_t = np.loadtxt(os.path.join(a.workdir, "map", "apparent_barrier_eV.csv"), delimiter=",")
        both = np.isfinite(phi_b) & np.isfinite(phi_t)
        print(f"  maps agree: median |difference| {np.median(np.abs(phi_b[both] - phi_t[both])):.2e} eV over "
              f"{both.sum()} pixels (max {np.max(np.abs(phi_b[both] - phi_t[both])):.2e} eV)")

    if not a.no_scaling:
        print("\nscaling (best of the runs, wall s of the whole command; MB/s end to end):")
        print(f"  {'grid':>12} {'samples':>8} {'threads':>7} {'MB':>7} {'wall s':>7} {'MB/s':>6} {'M samples/s':>11} {'RSS MB':>7}")
        cases = [(64, 64, 128, 2), (128, 128, 128, 2), (256, 256, 128, 2), (128, 128, 64, 2), (128, 128, 256, 2),
                 (256, 256, 128, 1)]
        for nx, ny, pts, th in cases:
            g = os.path.join(a.workdir, f"{'grid' if a.python_synth else 'synth'}_{nx}x{ny}x{pts}.csv")
            sz = synth(g, nx, ny, pts)
            rs = [run_map(exe, g, os.path.join(a.workdir, "map_s"), th) for _ in range(a.repeat)]
            r = min(rs, key=lambda q: q["wall"])
            print(f"  {f'{nx}x{ny}':>12} {pts:>8} {th:>7} {sz / 1e6:>7.1f} {r['wall']:>7.3f} {sz / 1e6 / r['wall']:>6.0f} "
                  f"{r['samples'] / r['wall'] / 1e6:>11.1f} {r['rss']:>7.1f}")
    print(f"\nconditions at end: {conditions()}")


if __name__ == "__main__":
    main()
