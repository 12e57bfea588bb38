#!/usr/bin/python3
"""Bench (not run by ctest): whole-command time of `plan` and `predict` with configs/example.yaml
(paraboloid tip, 400 Monte Carlo draws plus linear propagation), and the same with the
contact-anchored geometry, for two tipgap executables side by side in one run (issue 14).

Each command runs --repeat times per executable, alternating the executables, and the best wall
and CPU time (user + sys of the child, from wait4) is kept: the machine is shared, and the minimum
is the least disturbed run. Prints both and the ratios.

usage: /usr/bin/python3 tests/bench/uncertainty_commands.py <reference-tipgap> <new-tipgap> [--repeat N]
"""
import argparse
import os
import re
import subprocess
import sys
import tempfile
import time

HERE = os.path.dirname(os.path.abspath(__file__))
EXAMPLE = os.path.join(HERE, "..", "..", "configs", "example.yaml")


def run(cmd):
    """Wall time and user + sys CPU time of one child process (output discarded)."""
    t0 = time.perf_counter()
    with open(os.devnull, "w") as null:
        p = subprocess.Popen(cmd, stdout=null, stderr=null)
        _, status, usage = os.wait4(p.pid, 0)
    wall = time.perf_counter() - t0
    if os.waitstatus_to_exitcode(status) != 0:
        raise SystemExit(f"failed: {' '.join(cmd)}")
    return wall, usage.ru_utime + usage.ru_stime


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("reference")
    ap.add_argument("new")
    ap.add_argument("--repeat", type=int, default=3)
    args = ap.parse_args()
    with tempfile.TemporaryDirectory() as tmp:
        contact = os.path.join(tmp, "example-contact.yaml")
        with open(EXAMPLE) as fh:
            text = re.sub(r"kind: paraboloid", "kind: contact_anchored", fh.read())
        with open(contact, "w") as fh:
            fh.write(text)
        cases = []
        for name, cfg in (("paraboloid", EXAMPLE), ("contact_anchored", contact)):
            cases.append((f"plan 1 nA, 0.1 V ({name})", ["plan", "--config", cfg, "--current", "1nA", "--bias", "0.1V",
                                                         "--format", "json"]))
            cases.append((f"predict 6 gaps 0.4-0.9 nm, 0.1 V ({name})",
                          ["predict", "--config", cfg, "--gap", "0.4nm..0.9nm", "--points", "6", "--bias", "0.1V",
                           "--format", "json"]))
        print(f"{'command':48} {'reference wall/CPU s':>22} {'new wall/CPU s':>18} {'ratio wall/CPU':>16}")
        for label, cmd in cases:
            best = {"ref": [float("inf")] * 2, "new": [float("inf")] * 2}
            for _ in range(args.repeat):
                for key, exe in (("ref", args.reference), ("new", args.new)):
                    wall, cpu = run([exe] + cmd)
                    best[key] = [min(best[key][0], wall), min(best[key][1], cpu)]
            r, n = best["ref"], best["new"]
            print(f"{label:48} {r[0]:10.3f} / {r[1]:7.3f} {n[0]:8.3f} / {n[1]:7.3f} {r[0] / n[0]:7.1f}x / {r[1] / n[1]:5.1f}x")
    return 0


if __name__ == "__main__":
    sys.exit(main())
