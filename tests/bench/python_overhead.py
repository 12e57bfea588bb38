#!/usr/bin/python3
"""Bench (not run by ctest): the Python module's cost per point against the CLI's, and two Python
threads calling predict at once. Prints, in one run:

  1. a 4,000-point predict: `tipgap predict --format json` (the whole command: start, config,
     model, JSON) against tipgap.predict on the same points, per point and as a ratio (the issue's
     target: the module within 1.2x of the CLI), on one worker thread and on all cores;
  2. the same call from two Python threads at once against one thread alone (the GIL is released
     during the computation, so two threads should take about as long as one on two free cores):
     speed-up = 2 x (one call alone) / (two calls at once), 2.0 ideal; and the process's CPU time
     over the wall time of the two calls (how many cores they kept busy at once: at most 1.0 if
     the GIL were held, 2.0 ideal), which other work on a shared machine lowers less than the
     speed-up.

The load average is printed first: on a machine busy with other work both figures fall short.

Each time is the best of --repeat runs (the least disturbed by other work on the machine).

usage: PYTHONPATH=<build>/python /usr/bin/python3 tests/bench/python_overhead.py <build>/cli/tipgap [--repeat N]
"""
import argparse
import os
import subprocess
import threading
import time

import numpy

import tipgap

POINTS = 4000
GAP_NM = (0.3, 1.5)
BIAS_V = 0.5


def best(f, repeat):
    times = []
    for _ in range(repeat):
        t0 = time.perf_counter()
        f()
        times.append(time.perf_counter() - t0)
    return min(times)


def cli_seconds(exe, threads, repeat):
    args = [exe, "predict", "--gap", "%gnm..%gnm" % GAP_NM, "--points", str(POINTS), "--bias", "%gV" % BIAS_V,
            "--format", "json", "--threads", str(threads)]
    return best(lambda: subprocess.run(args, check=True, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL), repeat)


def two_threads(cfg, gaps, repeat):
    """Best wall time of two concurrent calls, and the CPU time over the wall time of that run."""
    runs = []
    for _ in range(repeat):
        ts = [threading.Thread(target=tipgap.predict, args=(cfg, gaps, BIAS_V), kwargs={"threads": 1}) for _ in range(2)]
        wall0, cpu0 = time.perf_counter(), time.process_time()
        for t in ts:
            t.start()
        for t in ts:
            t.join()
        wall, cpu = time.perf_counter() - wall0, time.process_time() - cpu0
        runs.append((wall, cpu / wall))
    return min(runs)


def main():
    ap = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    ap.add_argument("tipgap")
    ap.add_argument("--repeat", type=int, default=5)
    a = ap.parse_args()
    cfg = tipgap.Config.default()
    gaps = numpy.linspace(*GAP_NM, POINTS)
    tipgap.predict(cfg, gaps[:10], BIAS_V)  # warm up (first-touch of the module's pages)
    with open("/proc/loadavg") as f:
        print("load average (1, 5, 15 min): %s on %d cores" % (" ".join(f.read().split()[:3]), os.cpu_count()))
    print("predict, %d points (best of %d)" % (POINTS, a.repeat))
    print("%-10s %14s %14s %8s" % ("threads", "CLI us/point", "Python us/point", "ratio"))
    for threads in (1, 0):
        cli = cli_seconds(a.tipgap, threads, a.repeat)
        py = best(lambda: tipgap.predict(cfg, gaps, BIAS_V, threads=threads), a.repeat)
        print("%-10s %14.2f %14.2f %8.3f" % (threads or "all", cli / POINTS * 1e6, py / POINTS * 1e6, py / cli))
    one = best(lambda: tipgap.predict(cfg, gaps, BIAS_V, threads=1), a.repeat)
    two, busy = two_threads(cfg, gaps, a.repeat)
    print("two Python threads, one worker each: one call %.3f s, two at once %.3f s, speed-up %.2f, "
          "cores busy %.2f (2.0 ideal)" % (one, two, 2 * one / two, busy))


if __name__ == "__main__":
    main()
