#!/usr/bin/env bash
# CLI test of the reader options of `tipgap fit` and `tipgap map` (issue 10): a tab-separated export
# with units in parentheses, extra columns, decimal commas, no bias line and z growing towards the
# sample is refused without --flip-z (exit 3, naming it) and fitted with it to the same kappa as the
# same curve in tipgap's own layout; --columns by name and by index; a header-less file; --bias
# overriding a file's value with a note on stderr and in the JSON; usage errors naming the flag;
# the same for a grid with `tipgap map`.
# Env: TIPGAP (executable), TIPGAP_PYTHON (Debian python3).
set -euo pipefail
: "${TIPGAP:?}" "${TIPGAP_PYTHON:?}"
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
fail() { echo "FAIL: $*" >&2; exit 1; }

# One noise-free curve, kappa = 10/nm (I = 1 nA exp(-2 kappa z), Binnig et al., Appl. Phys. Lett.
# 40, 178 (1982)), in tipgap's layout and in three others; and a 4x3 grid of it in two layouts.
"$TIPGAP_PYTHON" - "$tmp" <<'PY'
import math, sys
d = sys.argv[1]
zs = [0.4 * k / 40 for k in range(41)]          # nm
cur = [1000.0 * math.exp(-20.0 * z) for z in zs]  # pA
dc = lambda v: repr(v).replace(".", ",")
with open(f"{d}/own.csv", "w") as f:
    f.write("# bias: 100 mV\nz [nm],current [pA]\n")
    f.writelines(f"{z!r},{i!r}\n" for z, i in zip(zs, cur))
with open(f"{d}/export.tsv", "w") as f:  # Z is the piezo extension: it grows as the tip approaches
    f.write("\ufeffTime (s)\tZ (m)\tI (A)\tAux (V)\r\n")
    f.writelines(f"{dc(0.01 * k)}\t{dc(0.4e-9 - z * 1e-9)}\t{dc(i * 1e-12)}\t0,5\r\n" for k, (z, i) in enumerate(zip(zs, cur)))
with open(f"{d}/bare.txt", "w") as f:
    f.write("# logger output, no header\n")
    f.writelines(f"{k}  {z!r}  {i!r}\n" for k, (z, i) in enumerate(zip(zs, cur)))
with open(f"{d}/bad.tsv", "w") as f:
    f.write("Z (nm)\tI (pA)\n0,1\t5\n0,2\tx\n")
with open(f"{d}/grid.csv", "w") as f, open(f"{d}/grid.txt", "w") as g:
    f.write("# bias: 0.1 V\nx [nm],y [nm],z [nm],current [pA]\n")
    g.write("X/nm;Y/nm;Height/nm;Signal/pA;I/pA\n")
    for y in range(3):
        for x in range(4):
            for z, i in zip(zs, cur):
                f.write(f"{x},{y},{z!r},{i!r}\n")
                g.write(f"{x};{y};{dc(-z)};{dc(i)};0\n")
PY

kappa() { "$TIPGAP_PYTHON" -c 'import json,sys; print(json.load(open(sys.argv[1]))["curves"][0]["decay_constant_per_nm"])' "$1"; }
same() {  # same NAME A B: equal to 1e-9 relative (the same digits in other units and layouts)
  "$TIPGAP_PYTHON" -c 'import sys; a, b = float(sys.argv[2]), float(sys.argv[3]); sys.exit(0 if abs(a - b) <= 1e-9 * abs(b) else 1)' "$@" \
    || fail "$1: $2 != $3"
}

"$TIPGAP" fit "$tmp/own.csv" --format json > "$tmp/own.json"
ref=$(kappa "$tmp/own.json")
same "reference kappa" "$ref" 10

# The export without --flip-z: exit 3, one line, naming --flip-z. The quarters hold 10 of the 41
# points; their medians are the means of the 5th and 6th from either end: 1 nA (e^-0.8 + e^-1)/2
# = 4.09e-10 A and 1 nA (e^-7 + e^-7.2)/2 = 8.29e-13 A.
set +e
"$TIPGAP" fit "$tmp/export.tsv" > "$tmp/out" 2> "$tmp/err"; rc=$?
set -e
[ $rc -eq 3 ] || fail "rising current: exit $rc"
grep -qx "tipgap: error: $tmp/export.tsv: |I| rises with z (median 4.09e-10 A over the quarter of the points with the largest z, 8.29e-13 A over the quarter with the smallest): z must grow as the tip retracts; if z in this file grows as the tip approaches, read it with --flip-z" "$tmp/err" \
  || fail "rising current message: $(cat "$tmp/err")"
[ ! -s "$tmp/out" ] || fail "rising current wrote to stdout"

# With --flip-z (and the columns by name, any case): the reference kappa; --bias for the file
# that states none gives no note.
"$TIPGAP" fit "$tmp/export.tsv" --flip-z --columns z,i --bias 100mV --temperature 4.2K --format json > "$tmp/export.json" 2> "$tmp/err"
same "export kappa" "$(kappa "$tmp/export.json")" "$ref"
[ ! -s "$tmp/err" ] || fail "unexpected stderr: $(cat "$tmp/err")"
"$TIPGAP_PYTHON" -c 'import json,sys; d=json.load(open(sys.argv[1])); assert d["notes"] == [], d["notes"]' "$tmp/export.json"
# By index, the delimiter forced.
"$TIPGAP" fit "$tmp/export.tsv" --flip-z --columns 2,3 --delimiter tab --format json > "$tmp/index.json"
same "index kappa" "$(kappa "$tmp/index.json")" "$ref"

# Header-less, whitespace separated, with units given.
"$TIPGAP" fit "$tmp/bare.txt" --columns 2,3 --z-unit nm --current-unit pA --format json > "$tmp/bare.json"
same "header-less kappa" "$(kappa "$tmp/bare.json")" "$ref"

# --bias against a file that states another: the command line wins, a note on stderr and in JSON.
"$TIPGAP" fit "$tmp/own.csv" --bias 200mV --format json > "$tmp/note.json" 2> "$tmp/err"
grep -qx "tipgap: note: $tmp/own.csv: the file states bias 100 mV; the given 0.2 V is used instead" "$tmp/err" \
  || fail "bias note on stderr: $(cat "$tmp/err")"
"$TIPGAP_PYTHON" - "$tmp/note.json" "$tmp/own.csv" <<'PY'
import json, sys
d = json.load(open(sys.argv[1]))
assert d["notes"] == [f"{sys.argv[2]}: the file states bias 100 mV; the given 0.2 V is used instead"], d["notes"]
PY

# A bad cell of a tab-separated file: file:line:column as always.
set +e
"$TIPGAP" fit "$tmp/bad.tsv" 2> "$tmp/err"; rc=$?
set -e
[ $rc -eq 3 ] || fail "bad cell: exit $rc"
grep -qx "tipgap: error: $tmp/bad.tsv:3:5: 'x' in column 'I' is not a number; expected a plain number such as 0.25 (the unit goes in the header)" "$tmp/err" \
  || fail "bad cell message: $(cat "$tmp/err")"

# Usage errors name the flag (exit 2).
usage() {  # usage FRAGMENT ARGS...
  local want=$1; shift
  set +e
  "$TIPGAP" "$@" > /dev/null 2> "$tmp/err"; local rc=$?
  set -e
  [ $rc -eq 2 ] || fail "$*: exit $rc"
  grep -qF "tipgap: usage error: $want" "$tmp/err" || fail "$*: $(cat "$tmp/err")"
}
usage "--columns: 1 column given; expected 2 (z, current)" fit "$tmp/own.csv" --columns Z
usage "--columns: 3 columns given; expected 4 (x, y, z, current)" map "$tmp/grid.csv" --columns 1,2,3 --output-dir "$tmp/m"
usage "--delimiter: 'pipe' is not a delimiter; expected detect, comma, tab, semicolon or space" fit "$tmp/own.csv" --delimiter pipe
usage "--bias: 0 V is out of range" fit "$tmp/own.csv" --bias 0V
usage "--temperature: -3 K is out of range" fit "$tmp/own.csv" --temperature -3K
usage "--z-unit: unknown unit 'furlong'" fit "$tmp/own.csv" --z-unit furlong

# map: the other layout with z growing towards the sample, refused, then read with the flags; the
# same barrier as the reference grid; summary.json records the reader settings and the note.
"$TIPGAP" map "$tmp/grid.csv" --output-dir "$tmp/ref_map" --quiet
set +e
"$TIPGAP" map "$tmp/grid.txt" --columns X,Y,Height,Signal --output-dir "$tmp/bad_map" --quiet 2> "$tmp/err"; rc=$?
set -e
[ $rc -eq 3 ] || fail "map rising: exit $rc"
grep -qF "|I| rises with z (in 12 of 12 pixels" "$tmp/err" || fail "map rising message: $(cat "$tmp/err")"
grep -qF "read it with --flip-z" "$tmp/err" || fail "map rising message: $(cat "$tmp/err")"
[ ! -e "$tmp/bad_map" ] || fail "a refused map left its output directory"
"$TIPGAP" map "$tmp/grid.txt" --columns X,Y,Height,Signal --flip-z --bias 0.1V --output-dir "$tmp/map" --quiet 2> "$tmp/err"
[ ! -s "$tmp/err" ] || fail "map stderr: $(cat "$tmp/err")"
"$TIPGAP_PYTHON" - "$tmp/ref_map/summary.json" "$tmp/map/summary.json" <<'PY'
import json, sys
ref, got = (json.load(open(p)) for p in sys.argv[1:])
a, b = ref["apparent_barrier_eV"]["median"], got["apparent_barrier_eV"]["median"]
assert abs(a - b) <= 1e-9 * a, (a, b)
assert got["reader"] == {"columns": "X,Y,Height,Signal", "flip_z": "true", "bias_V": "0.1V"}, got["reader"]
assert got["notes"] == [] and ref["notes"] == [] and ref["reader"] == {}, (got["notes"], ref)
PY
"$TIPGAP" map "$tmp/grid.csv" --bias 0.2V --output-dir "$tmp/map2" --quiet 2> "$tmp/err"
grep -qx "tipgap: note: $tmp/grid.csv: the file states bias 0.1 V; the given 0.2 V is used instead" "$tmp/err" \
  || fail "map bias note: $(cat "$tmp/err")"
"$TIPGAP_PYTHON" -c 'import json,sys; n=json.load(open(sys.argv[1]))["notes"]; assert n == ["the file states bias 0.1 V; the given 0.2 V is used instead"], n' "$tmp/map2/summary.json"

# Every reader flag has help text.
for cmd in fit map; do
  help=$("$TIPGAP" $cmd --help)
  for f in --delimiter --columns --z-unit --current-unit --flip-z --bias --temperature; do
    grep -q -- "$f" <<< "$help" || fail "$cmd --help lacks $f"
  done
done
grep -q -- "--xy-unit" <<< "$("$TIPGAP" map --help)" || fail "map --help lacks --xy-unit"
echo "reader_cli: ok"
