#!/usr/bin/env bash
# CLI test of `tipgap map`: a synthetic 16 x 16 x 64 grid with a disc of lower barrier (written by
# tests/bench/grid_synth.py, synthetic data), every output file, identical outputs for 1 and 2
# threads, quality codes, the atomic output directory and the error messages / exit codes.
# Env: TIPGAP (executable), TIPGAP_SOURCE_DIR, TIPGAP_PYTHON (Debian python3 with numpy).
set -euo pipefail
: "${TIPGAP:?}" "${TIPGAP_SOURCE_DIR:?}" "${TIPGAP_PYTHON:?}"
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
fail() { echo "FAIL: $*" >&2; exit 1; }

"$TIPGAP_PYTHON" "$TIPGAP_SOURCE_DIR/tests/bench/grid_synth.py" "$tmp/grid.csv" --nx 16 --ny 16 --points 64 \
  --pattern disc --barrier-eV 4.0 --disc-barrier-eV 3.0 --disc-radius 0.3 --seed 3

# Two runs; stdout is the three-line summary.
"$TIPGAP" map "$tmp/grid.csv" --output-dir "$tmp/t1" --threads 1 > "$tmp/out1.txt"
"$TIPGAP" map "$tmp/grid.csv" --output-dir "$tmp/t2" --threads 2 > "$tmp/out2.txt" 2> "$tmp/err2.txt"
[ ! -s "$tmp/err2.txt" ] || fail "stderr not empty (no terminal: no progress bar): $(cat "$tmp/err2.txt")"
head -1 "$tmp/out1.txt" | grep -qx "tipgap map: 16 x 16 pixels, 16384 samples -> $tmp/t1" || fail "summary line: $(head -1 "$tmp/out1.txt")"
grep -qx "  quality: ok 256, too_few_points 0, saturated 0, contact 0, poor_fit 0, missing 0" "$tmp/out1.txt" || fail "quality line: $(cat "$tmp/out1.txt")"
for f in apparent_barrier_eV.csv decay_constant_per_nm.csv stderr_apparent_barrier_eV.csv quality.csv summary.json \
         barrier_map.png barrier_histogram.png stderr_map.png quality_map.png; do
  [ -s "$tmp/t1/$f" ] || fail "missing $f"
done
[ "$(ls -A "$tmp/t1" | wc -l)" -eq 9 ] || fail "extra files in the output: $(ls -A "$tmp/t1")"
# Identical results for 1 and 2 threads: every matrix byte for byte, the figures too, and the summary
# apart from its run-dependent entries (threads, timings).
for f in apparent_barrier_eV.csv decay_constant_per_nm.csv stderr_apparent_barrier_eV.csv quality.csv \
         barrier_map.png barrier_histogram.png stderr_map.png quality_map.png; do
  cmp -s "$tmp/t1/$f" "$tmp/t2/$f" || fail "$f differs between --threads 1 and 2"
done
"$TIPGAP_PYTHON" - "$tmp" <<'PY'
import json, math, sys
import numpy as np
d = sys.argv[1]
a, b = (json.load(open(f"{d}/{t}/summary.json")) for t in ("t1", "t2"))
assert (a["threads"], b["threads"]) == (1, 2), (a["threads"], b["threads"])
for s in (a, b):
    del s["threads"], s["timings"]
assert a == b, "summary.json differs beyond threads/timings"

# Matrices: 16 rows (y) of 16 columns (x), '#' header lines, numpy reads them.
phi = np.loadtxt(f"{d}/t1/apparent_barrier_eV.csv", delimiter=",")
se = np.loadtxt(f"{d}/t1/stderr_apparent_barrier_eV.csv", delimiter=",")
kap = np.loadtxt(f"{d}/t1/decay_constant_per_nm.csv", delimiter=",")
q = np.loadtxt(f"{d}/t1/quality.csv", delimiter=",", dtype=int)
assert phi.shape == (16, 16) and q.shape == (16, 16), (phi.shape, q.shape)
head = open(f"{d}/t1/apparent_barrier_eV.csv").read().split("\n")[:3]
assert head[1] == "# x [nm]: " + ",".join(str(k) for k in range(16)), head[1]
assert head[2] == "# y [nm]: " + ",".join(str(k) for k in range(16)), head[2]
# phi = hbar^2 kappa^2 / 2m (CODATA 2018) between the two matrices.
hbar = 6.62607015e-34 / (2 * math.pi); me = 9.1093837015e-31; e = 1.602176634e-19
assert np.allclose(phi, hbar**2 * (kap * 1e9) ** 2 / (2 * me) / e, rtol=1e-12)
# Truth as written by grid_synth.py: disc of radius 0.3 * 16 = 4.8 px about (7.5, 7.5).
iy, ix = np.mgrid[0:16, 0:16]
disc = (ix - 7.5) ** 2 + (iy - 7.5) ** 2 <= 4.8 ** 2
truth = np.where(disc, 3.0, 4.0)
ok = q == 0
# 95 % of ok pixels within 3 sigma (Gaussian noise gives 99.7 %; the sigma is estimated per pixel
# from ~40 degrees of freedom), region means within 0.01 eV (sigma_mean ~ 0.002 eV).
within = np.abs(phi - truth) <= 3 * se
assert within[ok].mean() >= 0.95, within[ok].mean()
assert abs(phi[disc & ok].mean() - 3.0) < 0.01, phi[disc & ok].mean()
assert abs(phi[~disc & ok].mean() - 4.0) < 0.01, phi[~disc & ok].mean()
s = a
assert s["generator"] == "tipgap map"
assert (s["grid"]["nx"], s["grid"]["ny"], s["grid"]["samples"]) == (16, 16, 16384)
assert s["grid"]["pitch_x_nm"] == 1.0 and s["grid"]["pitch_y_nm"] == 1.0, s["grid"]
st = s["apparent_barrier_eV"]
vals = phi[np.isfinite(phi)]
# Same statistics as numpy (numpy.percentile's default method = Hyndman & Fan definition 7).
assert math.isclose(st["mean"], vals.mean(), rel_tol=1e-12)
assert math.isclose(st["median"], np.median(vals), rel_tol=1e-12)
assert math.isclose(st["standard_deviation"], vals.std(ddof=1), rel_tol=1e-10)
for k, v in st["percentiles"].items():
    assert math.isclose(v, np.percentile(vals, float(k[1:])), rel_tol=1e-12), (k, v)
assert s["quality_counts"] == {"ok": 256, "too_few_points": 0, "saturated": 0, "contact": 0, "poor_fit": 0, "missing": 0}
assert s["quality_codes"] == {"0": "ok", "1": "too_few_points", "2": "saturated", "3": "contact", "4": "poor_fit", "5": "missing"}
PY

# --range sets the barrier map's colours; a reversed range is a usage error naming the flag (issue 15).
"$TIPGAP" map "$tmp/grid.csv" --output-dir "$tmp/ranged" --range 2.8eV..4.2eV --quiet || fail "--range"
set +e
"$TIPGAP" map "$tmp/grid.csv" --output-dir "$tmp/bad" --range 4.2eV..2.8eV --quiet 2> "$tmp/range_err.txt"
rc=$?
set -e
[ "$rc" -eq 2 ] || fail "reversed --range: exit $rc"
grep -qx "tipgap: usage error: --range: MIN must be below MAX; got 4.2..2.8 eV" "$tmp/range_err.txt" || fail "range message: $(cat "$tmp/range_err.txt")"

# PNG files really are PNG images.
for f in barrier_map.png barrier_histogram.png stderr_map.png quality_map.png; do
  [ "$(head -c 8 "$tmp/t1/$f" | od -An -tx1 | tr -d ' \n')" = "89504e470d0a1a0a" ] || fail "$f is not a PNG"
done

# Quality codes: clip one pixel (saturation), put one in contact, flatten one to noise.
"$TIPGAP_PYTHON" - "$tmp/grid.csv" "$tmp/special.csv" <<'PY'
import sys
rows = open(sys.argv[1]).read().split("\n")
out = []
for r in rows:
    c = r.split(",")
    if len(c) == 4 and c[0] == "3" and c[1] == "4":      # saturated: the amplifier clips at 500 pA
        c[3] = str(min(float(c[3]), 500.0))
    if len(c) == 4 and c[0] == "10" and c[1] == "12" and float(c[2]) < 0.02:  # contact: 2 uA = 0.26 G0 at 100 mV
        c[3] = "2e6"
    if len(c) == 4 and c[0] == "0" and c[1] == "15":     # nothing above the noise floor
        c[3] = "0.1"
    out.append(",".join(c))
open(sys.argv[2], "w").write("\n".join(out))
PY
"$TIPGAP" map "$tmp/special.csv" --output-dir "$tmp/sp" --quiet > "$tmp/quiet.txt"
[ ! -s "$tmp/quiet.txt" ] || fail "--quiet printed: $(cat "$tmp/quiet.txt")"
"$TIPGAP_PYTHON" - "$tmp/sp" <<'PY'
import json, sys
import numpy as np
q = np.loadtxt(f"{sys.argv[1]}/quality.csv", delimiter=",", dtype=int)
phi = np.loadtxt(f"{sys.argv[1]}/apparent_barrier_eV.csv", delimiter=",")
assert q[4, 3] == 2, q[4, 3]
assert q[12, 10] == 3, q[12, 10]
assert q[15, 0] == 1 and np.isnan(phi[15, 0]), (q[15, 0], phi[15, 0])
assert np.isfinite(phi[4, 3]) and np.isfinite(phi[12, 10])
c = json.load(open(f"{sys.argv[1]}/summary.json"))["quality_counts"]
assert c == {"ok": 253, "too_few_points": 1, "saturated": 1, "contact": 1, "poor_fit": 0, "missing": 0}, c
PY

# Errors: a truncated file and an unsorted file; no output directory appears.
head -c 150000 "$tmp/grid.csv" > "$tmp/cut.csv"
set +e
"$TIPGAP" map "$tmp/cut.csv" --output-dir "$tmp/cut_map" 2> "$tmp/err.txt"; rc=$?
set -e
[ $rc -eq 3 ] || fail "truncated file: exit $rc"
grep -Eq "^tipgap: error: $tmp/cut.csv:[0-9]+:[0-9]+: (empty cell in column 'current'; expected a number|the row has [0-9] cells?;)" "$tmp/err.txt" || fail "truncated file message: $(cat "$tmp/err.txt")"
[ ! -e "$tmp/cut_map" ] || fail "a failed map left an output directory"
[ -z "$(ls -A "$tmp" | grep '^\.cut_map')" ] || fail "a failed map left its temporary directory"
"$TIPGAP_PYTHON" - "$tmp/grid.csv" "$tmp/unsorted.csv" <<'PY'
import sys
lines = open(sys.argv[1]).read().split("\n")
head, rows = lines[:5], lines[5:]
rows.insert(100, rows.pop(10))          # a row of pixel (0, 0) moved into pixel (1, 0)
open(sys.argv[2], "w").write("\n".join(head + rows))
PY
set +e
"$TIPGAP" map "$tmp/unsorted.csv" --output-dir "$tmp/u_map" 2> "$tmp/err.txt"; rc=$?
set -e
[ $rc -eq 3 ] || fail "unsorted file: exit $rc"
grep -qx "tipgap: error: $tmp/unsorted.csv:[0-9]*:1: pixel (x = 0 nm, y = 0 nm) appears again (first at line 6); each pixel's rows must be together, with every pixel once (rows of different pixels interleaved, or a pixel repeated?)" "$tmp/err.txt" \
  || fail "unsorted message: $(cat "$tmp/err.txt")"

# An earlier output is replaced whole; a directory with other files is refused.
"$TIPGAP" map "$tmp/grid.csv" --output-dir "$tmp/t1" --quiet
touch "$tmp/t1/mine.txt"
set +e
"$TIPGAP" map "$tmp/grid.csv" --output-dir "$tmp/t1" --quiet 2> "$tmp/err.txt"; rc=$?
set -e
[ $rc -eq 3 ] || fail "foreign directory: exit $rc"
grep -qx "tipgap: error: $tmp/t1: exists and holds 'mine.txt', which this command does not write; it replaces only an empty directory or its own earlier output. Remove it or choose another directory" "$tmp/err.txt" \
  || fail "foreign directory message: $(cat "$tmp/err.txt")"
[ -e "$tmp/t1/mine.txt" ] || fail "a user file was removed"

# Usage errors.
set +e
"$TIPGAP" map "$tmp/grid.csv" --threads -1 2> "$tmp/err.txt"; rc=$?
set -e
[ $rc -eq 2 ] || fail "--threads -1: exit $rc"
grep -qx "tipgap: usage error: --threads: must be >= 0 (0 = all cores)" "$tmp/err.txt" || fail "threads message: $(cat "$tmp/err.txt")"
echo "map CLI: all checks passed"
