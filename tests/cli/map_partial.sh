#!/usr/bin/env bash
# tipgap map --partial: an aborted acquisition (a grid CSV cut inside a row of a pixel) maps the
# pixels that are there, marks the others 'missing' with NaN cells and says how many; without the
# option the error names --partial.
set -u
PY=${TIPGAP_PYTHON:-/usr/bin/python3}
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
fail() { echo "FAIL: $*" >&2; exit 1; }

"$TIPGAP" synth --grid 8x8 --points-per-curve 64 --noise 1pA --out "$work/g.csv" > /dev/null || fail "synth grid"
# Cut inside a row of the pixel (x = 0, y = 3): 25 pixels whole or cut short, 7 of the 8x4 grid missing.
head -c 30000 "$work/g.csv" > "$work/cut.csv"
"$TIPGAP" map "$work/cut.csv" --output-dir "$work/m1" --quiet 2> "$work/e1"; rc=$?
[ $rc -eq 3 ] || fail "without --partial: exit $rc, expected 3"
grep -q "tipgap map --partial" "$work/e1" || { cat "$work/e1"; fail "the error does not name --partial"; }
[ -e "$work/m1" ] && fail "a refused map left a directory"
"$TIPGAP" map "$work/cut.csv" --output-dir "$work/m2" --partial > "$work/out" 2> "$work/e2" || fail "--partial exited $?"
grep -q "partial grid: 7 of 32 pixels missing" "$work/out" || { cat "$work/out"; fail "missing count"; }
grep -q "unfinished row is left out" "$work/e2" || { cat "$work/e2"; fail "cut row warning"; }
"$PY" - "$work/m2" <<'PYEOF' || fail "partial map files"
import json, math, sys
d = sys.argv[1]
s = json.load(open(d + "/summary.json"))
assert s["quality_counts"]["missing"] == 7 and s["quality_counts"]["ok"] == 25, s["quality_counts"]
def rows(name):
    return [l.strip().split(",") for l in open(d + "/" + name) if not l.startswith("#")]
q = rows("quality.csv")
phi = rows("apparent_barrier_eV.csv")
assert len(q) == 4 and all(len(r) == 8 for r in q), q
missing = [(y, x) for y in range(4) for x in range(8) if q[y][x] == "5"]
assert missing == [(3, x) for x in range(1, 8)], missing
assert all(math.isnan(float(phi[y][x])) for y, x in missing)
assert all(not math.isnan(float(phi[y][x])) for y in range(4) for x in range(8) if (y, x) not in missing)
PYEOF
echo "map --partial CLI: ok"
