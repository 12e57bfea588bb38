#!/usr/bin/python3
"""Barrier-map benchmark on a 128 x 128 x 128 grid, every contender in ONE run, side by side.

Run by hand (not by ctest), from the source tree after a Release build (targets tipgap and
map_read_fit_bench):
    /usr/bin/python3 tests/bench/map_bench.py [--tipgap build/cli/tipgap]
        [--bench build/tests/bench/map_read_fit_bench] [--workdir /tmp/tipgap_map_bench] [--repeat 5]
        [--reference OLD-tipgap] [--reference-bench OLD-map_read_fit_bench] [--no-polyfit] [--no-scaling]

1. Makes a seeded grid with `tipgap synth --grid 128x128 --pitch 1nm --points-per-curve 128
   --pattern disc --noise 1pA --seed 7` (synthetic, 44 MB) and reads it once into the page cache.
2. Whole command: `tipgap map GRID --threads 2 --quiet` (all outputs, figures included), alternating
   with an older executable when --reference is given, and with --no-figures: wall, CPU (user + sys),
   MB/s.
3. Read + fit alone: map_read_fit_bench (Google Benchmark; make_barrier_map without output files,
   and read_grid with an empty visitor), 1 and 2 threads, wall MB/s and CPU per run.
4. NumPy, vectorised: numpy.loadtxt, then the same noise-floor selection and the two weighted
   least-squares passes for all pixels at once (closed-form sums over an axis, no Python loop).
5. NumPy, per pixel: tests/bench/grid_bench.py's baseline (numpy.loadtxt plus one weighted
   numpy.polyfit per pixel and pass).
6. Ratios of the whole command to 4 and 5, from this one run; agreement of the maps.
7. Scaling: 8x8 to 256x256 pixels of 128 samples, 1 and 2 threads, best of --repeat.
Every figure is printed with the load average at that moment (the machine may be shared), and CPU
time beside wall time.
"""
import argparse
import json
import math
import os
import statistics
import subprocess
import sys
import time

HERE = os.path.dirname(os.path.abspath(__file__))
sys.path.insert(0, HERE)
import grid_bench  # noqa: E402  (synth, timed, the per-pixel polyfit baseline)

HBAR = 6.62607015e-34 / (2 * math.pi)  # CODATA 2018
ME = 9.1093837015e-31
EV = 1.602176634e-19


def load():
    return "load %.2f %.2f %.2f" % os.getloadavg()


# ---------------------------------------------------------------------------------------------
# The vectorised NumPy map, in a child process (map_bench.py --vectorised GRID OUT.npy).
def vectorised(grid, out):
    import numpy as np
    t0 = time.perf_counter()
    skip = 0
    with open(grid) as f:
        for line in f:
            skip += 1
            if not line.startswith("#"):
                break  # the header row
    data = np.loadtxt(grid, delimiter=",", skiprows=skip)
    t1 = time.perf_counter()
    x, y = data[:, 0], data[:, 1]
    change = np.flatnonzero((np.diff(x) != 0) | (np.diff(y) != 0)) + 1
    n = len(x) // (len(change) + 1)  # every pixel has the same number of samples
    z = (data[:, 2] * 1e-9).reshape(-1, n)
    cur = (data[:, 3] * 1e-12).reshape(-1, n)
    order = np.argsort(z, axis=1, kind="stable")
    z = np.take_along_axis(z, order, axis=1)
    cur = np.take_along_axis(cur, order, axis=1)
    a = np.abs(cur)
    tail_n = min(max(8, n // 5), max(n // 2, 3), n)
    tail = cur[:, ::-1][:, :tail_n]
    d = np.diff(tail, axis=1)
    sigma = 1.482602218505602 * np.median(np.abs(d - np.median(d, axis=1, keepdims=True)), axis=1) / math.sqrt(2)
    med = np.median(tail, axis=1)
    flat = 1.482602218505602 * np.median(np.abs(tail - med[:, None]), axis=1) < 2 * sigma
    floor = 3 * sigma + np.where(flat, np.abs(med), 0.0)
    with np.errstate(divide="ignore", invalid="ignore"):
        lna = np.log(a)

        def line(sel, w):
            # numpy.polyfit's w multiplies the residuals: the weights of the sums are w**2.
            ww = np.where(sel, w * w, 0.0)
            sw = ww.sum(1)
            zm = (ww * z).sum(1) / sw
            ym = (ww * np.where(sel, lna, 0.0)).sum(1) / sw
            dz = z - zm[:, None]
            slope = (ww * dz * (lna - ym[:, None])).sum(1) / (ww * dz * dz).sum(1)
            return slope, ym - slope * zm

        sel = a >= floor[:, None]
        ok = sel.sum(1) >= 3
        slope, icpt = line(sel, a / sigma[:, None])
        fitted = np.exp(icpt[:, None] + slope[:, None] * z)
        sel2 = (fitted >= floor[:, None]) & (a >= floor[:, None] / 3)
        again = ok & (sel2.sum(1) >= 3)
        slope2, _ = line(sel2, fitted / sigma[:, None])
        slope = np.where(again, slope2, slope)
        kappa = -0.5 * slope
        phi = np.where(ok, HBAR ** 2 * kappa ** 2 / (2 * ME) / EV, np.nan)
    xs, ys = np.unique(x), np.unique(y)
    starts = np.concatenate(([0], change))
    grid_phi = np.full((len(ys), len(xs)), np.nan)
    grid_phi[np.searchsorted(ys, y[starts]), np.searchsorted(xs, x[starts])] = phi
    t2 = time.perf_counter()
    np.save(out, grid_phi)
    print(json.dumps({"parse_s": t1 - t0, "fit_s": t2 - t1}))


def timed(cmd):
    """Runs cmd; returns (wall s, peak RSS MB, user s, sys s, stdout): wall from perf_counter, CPU
    from wait4's rusage (finer than /usr/bin/time's 10 ms), peak RSS from /usr/bin/time (wait4's
    would include this Python process's memory, which a forked child inherits until exec)."""
    import tempfile
    with tempfile.TemporaryFile() as out, tempfile.TemporaryFile() as err, \
            tempfile.NamedTemporaryFile(mode="r") as rss:
        t0 = time.perf_counter()
        p = subprocess.Popen(["/usr/bin/time", "-f", "%M", "-o", rss.name] + cmd, stdout=out, stderr=err)
        _, status, ru = os.wait4(p.pid, 0)
        wall = time.perf_counter() - t0
        p.returncode = os.waitstatus_to_exitcode(status)
        out.seek(0)
        err.seek(0)
        if p.returncode != 0:
            sys.exit(f"failed: {' '.join(cmd)}\n{err.read().decode()}")
        return wall, int(rss.read().split()[-1]) / 1024.0, ru.ru_utime, ru.ru_stime, out.read().decode()


def run_child(mode, grid, out_npy):
    wall, rss, user, sys_s, stdout = timed([sys.executable, os.path.abspath(__file__), mode, grid, out_npy])
    return {"wall": wall, "rss": rss, "cpu": user + sys_s, "load": load(), **json.loads(stdout.strip().splitlines()[-1])}


def run_map(exe, grid, out, threads, extra=()):
    wall, rss, user, sys_s, _ = timed([exe, "map", grid, "--output-dir", out, "--threads", str(threads),
                                                  "--quiet", *extra])
    summary = json.load(open(os.path.join(out, "summary.json")))
    return {"wall": wall, "rss": rss, "cpu": user + sys_s, "read_fit": summary["timings"]["read_and_fit_s"],
            "samples": summary["grid"]["samples"], "load": load()}


def best_of(runs):
    return min(runs, key=lambda r: r["wall"])


def read_fit_bench(bench, grid, repeat):
    """map_read_fit_bench's results: name -> (wall s per run, CPU s per run), best of `repeat`."""
    env = dict(os.environ, TIPGAP_BENCH_GRID=grid)
    r = subprocess.run([bench, "--benchmark_format=json", f"--benchmark_repetitions={repeat}",
                        "--benchmark_min_time=0.3"], capture_output=True, text=True, env=env, check=True)
    out = {}
    for b in json.loads(r.stdout)["benchmarks"]:
        if b.get("run_type") != "iteration":
            continue
        wall = b["real_time"] / 1e3  # ms -> s
        prev = out.get(b["run_name"])
        if prev is None or wall < prev[0]:
            out[b["run_name"]] = (wall, b["cpu_s"])
    return out


def main():
    if len(sys.argv) == 4 and sys.argv[1] == "--vectorised":
        vectorised(sys.argv[2], sys.argv[3])
        return
    if len(sys.argv) == 4 and sys.argv[1] == "--polyfit":
        grid_bench.baseline(sys.argv[2], sys.argv[3])
        return
    ap = argparse.ArgumentParser()
    ap.add_argument("--tipgap", default=os.path.join(HERE, "..", "..", "build", "cli", "tipgap"))
    ap.add_argument("--bench", default=os.path.join(HERE, "..", "..", "build", "tests", "bench", "map_read_fit_bench"))
    ap.add_argument("--workdir", default="/tmp/tipgap_map_bench")
    ap.add_argument("--repeat", type=int, default=5)
    ap.add_argument("--reference", help="an older tipgap executable, timed alternately on the whole command")
    ap.add_argument("--reference-bench", help="map_read_fit_bench built from the older sources")
    ap.add_argument("--no-polyfit", action="store_true")
    ap.add_argument("--no-scaling", action="store_true")
    a = ap.parse_args()
    exe = os.path.abspath(a.tipgap)
    grid_bench.SYNTH["exe"] = exe
    os.makedirs(a.workdir, exist_ok=True)
    print(f"conditions at start: {grid_bench.conditions()}")
    grid = os.path.join(a.workdir, "synth_128x128x128.csv")
    size = grid_bench.synth(grid, 128, 128, 128)
    mb = size / 1e6
    print(f"grid: {grid}, {mb:.1f} MB, 128 x 128 pixels x 128 samples (synthetic)\n")

    def show(name, wall, cpu, where):
        print(f"  {name:<44} wall {wall * 1e3:7.1f} ms  {mb / wall:6.0f} MB/s   CPU {cpu * 1e3:7.1f} ms   [{where}]")

    runs, ref_runs = [], []
    for _ in range(a.repeat):  # alternating with the reference executable, if given
        runs.append(run_map(exe, grid, os.path.join(a.workdir, "map"), 2))
        if a.reference:
            ref_runs.append(run_map(os.path.abspath(a.reference), grid, os.path.join(a.workdir, "map_ref"), 2))
    whole = best_of(runs)
    show("tipgap map --threads 2 (whole command)", whole["wall"], whole["cpu"], whole["load"])
    if ref_runs:
        ref = best_of(ref_runs)
        show("reference executable, same command", ref["wall"], ref["cpu"], ref["load"])
        print(f"    new / reference: {ref['wall'] / whole['wall']:.2f}x faster wall, {ref['cpu'] / whole['cpu']:.2f}x less CPU")
    print(f"    median wall {statistics.median(r['wall'] for r in runs) * 1e3:.1f} ms; read+fit in summary.json "
          f"{whole['read_fit'] * 1e3:.1f} ms = {mb / whole['read_fit']:.0f} MB/s; peak RSS {whole['rss']:.0f} MB")
    nofig = best_of([run_map(exe, grid, os.path.join(a.workdir, "map_nofig"), 2, ["--no-figures"])
                     for _ in range(a.repeat)])
    show("tipgap map --threads 2 --no-figures", nofig["wall"], nofig["cpu"], nofig["load"])

    if os.path.exists(a.bench):
        benches = [("", a.bench)] + ([("reference: ", a.reference_bench)] if a.reference_bench else [])
        for prefix, bench in benches:
            rf = read_fit_bench(bench, grid, a.repeat)
            where = load()
            for name, label in [("read_and_fit/1/real_time", "read + fit alone, 1 thread"),
                                ("read_and_fit/2/real_time", "read + fit alone, 2 threads"),
                                ("read_only/1/real_time", "read alone (parse), 1 thread"),
                                ("read_only/2/real_time", "read alone (parse), 2 threads")]:
                if name in rf:
                    show(prefix + label, rf[name][0], rf[name][1], where)
    else:
        print(f"  ({a.bench} not built: no read + fit benchmark)")

    vec = run_child("--vectorised", grid, os.path.join(a.workdir, "vectorised_phi.npy"))
    show("NumPy vectorised (loadtxt + batched WLS)", vec["wall"], vec["cpu"], vec["load"])
    print(f"    parse {vec['parse_s'] * 1e3:.0f} ms, fits {vec['fit_s'] * 1e3:.0f} ms, peak RSS {vec['rss']:.0f} MB")
    poly = None
    if not a.no_polyfit:
        poly = run_child("--polyfit", grid, os.path.join(a.workdir, "polyfit_phi.npy"))
        show("NumPy per pixel (loadtxt + polyfit per pixel)", poly["wall"], poly["cpu"], poly["load"])
        print(f"    parse {poly['parse_s'] * 1e3:.0f} ms, fits {poly['fit_s'] * 1e3:.0f} ms")

    print("\nratios from this run (wall; CPU in brackets):")
    for name, other in [("NumPy vectorised", vec), ("NumPy per-pixel polyfit", poly)]:
        if other:
            print(f"  whole command vs {name}: {other['wall'] / whole['wall']:.1f}x "
                  f"({other['cpu'] / whole['cpu']:.1f}x)")
    import numpy as np
    phi_t = np.loadtxt(os.path.join(a.workdir, "map", "apparent_barrier_eV.csv"), delimiter=",")
    for name, f in [("vectorised", "vectorised_phi.npy"), ("polyfit", "polyfit_phi.npy")]:
        p = os.path.join(a.workdir, f)
        if os.path.exists(p) and (name == "vectorised" or poly):
            phi_b = np.load(p)
            both = np.isfinite(phi_b) & np.isfinite(phi_t)
            diff = np.abs(phi_b[both] - phi_t[both])
            print(f"  map agrees with NumPy {name}: median |difference| {np.median(diff):.2e} eV, max "
                  f"{diff.max():.2e} eV over {both.sum()} pixels")

    if not a.no_scaling:
        print("\nscaling (whole command, best of the runs):")
        print(f"  {'grid':>9} {'threads':>7} {'MB':>7} {'wall ms':>8} {'CPU ms':>7} {'MB/s':>6} {'M samples/s':>11} "
              f"{'RSS MB':>6}  load")
        for threads in (1, 2):
            for side in (8, 16, 32, 64, 128, 256):
                g = os.path.join(a.workdir, f"synth_{side}x{side}x128.csv")
                sz = grid_bench.synth(g, side, side, 128)
                r = best_of([run_map(exe, g, os.path.join(a.workdir, "map_s"), threads) for _ in range(a.repeat)])
                print(f"  {f'{side}x{side}':>9} {threads:>7} {sz / 1e6:>7.2f} {r['wall'] * 1e3:>8.1f} "
                      f"{r['cpu'] * 1e3:>7.1f} {sz / 1e6 / r['wall']:>6.0f} {r['samples'] / r['wall'] / 1e6:>11.1f} "
                      f"{r['rss']:>6.0f}  {r['load']}")
    print(f"\nconditions at end: {grid_bench.conditions()}")


if __name__ == "__main__":
    main()
