#!/usr/bin/env bash
# tipgap predict: the output contract (JSON keys, full precision, CSV = JSON, negative biases,
# ranges and grids) and exit codes.
set -euo pipefail
T="${TIPGAP:?}"; PY="${TIPGAP_PYTHON:-/usr/bin/python3}"; SRC="${TIPGAP_SOURCE_DIR:?}"
tmp=$(mktemp -d); trap 'rm -rf "$tmp"' EXIT
fail() { echo "FAIL: $*"; exit 1; }

"$T" --version | grep -q '^tipgap [0-9]' || fail "--version"
"$T" --help | grep -q predict || fail "--help lists predict"
"$T" predict --help | grep -q -- '--gap' || fail "predict --help"

# Single point, both spellings of a negative bias, JSON contract.
"$T" predict --config "$SRC/configs/default.yaml" --gap 0.6nm --bias -0.5V --format json > "$tmp/a.json"
"$T" predict --config "$SRC/configs/default.yaml" --gap 6A --bias=-0.5V --format json > "$tmp/b.json"
"$PY" - "$tmp/a.json" "$tmp/b.json" <<'PYEOF'
import json, sys, math
a = json.load(open(sys.argv[1])); b = json.load(open(sys.argv[2]))
pa, pb = a["points"][0], b["points"][0]
keys = ["gap_nm", "bias_V", "temperature_K", "current_density_A_per_m2", "current_A", "conductance_S",
        "decay_constant_per_nm", "apparent_barrier_eV", "regime"]
for k in keys:
    assert k in pa, k
assert pa == pb, "6A and 0.6nm, -0.5V and =-0.5V give the same point"
assert pa["bias_V"] == -0.5 and abs(pa["gap_nm"] - 0.6) < 1e-15
assert pa["current_density_A_per_m2"] < 0 and pa["current_A"] < 0, "sign of the bias"
# 1 nm^2 planar area in the default config: I = J * 1e-18 m^2
assert abs(pa["current_A"] / (pa["current_density_A_per_m2"] * 1e-18) - 1) < 1e-12
# conductance = I/V
assert abs(pa["conductance_S"] / (pa["current_A"] / pa["bias_V"]) - 1) < 1e-12
# phi_ap = (hbar^2/8m)(2 kappa)^2 = (hbar^2/2m) kappa^2 with CODATA 2018 constants
k = pa["decay_constant_per_nm"]
hbar = 6.62607015e-34 / (2 * math.pi)  # CODATA 2018 exact h
hbar2_2m = (hbar**2 / (2 * 9.1093837015e-31)) / 1.602176634e-19 * 1e18
assert abs(pa["apparent_barrier_eV"] / (hbar2_2m * k * k) - 1) < 1e-9, (pa["apparent_barrier_eV"], hbar2_2m * k * k)
# Decay constant of a 4.5/5.3 eV junction at 0.6 nm: 9 to 12 per nm (from 0.5123 sqrt(phi) per Å; common practice)
assert 9 < k < 12, k
print("json ok")
PYEOF

# Grid: two ranges -> points x points rows; CSV numbers equal JSON numbers to the last digit.
"$T" predict --gap 0.5nm..1.0nm --bias -1V..1V --points 3 --format csv > "$tmp/g.csv"
"$T" predict --gap 0.5nm..1.0nm --bias -1V..1V --points 3 --format json > "$tmp/g.json"
"$PY" - "$tmp/g.csv" "$tmp/g.json" <<'PYEOF'
import csv, json, sys
rows = list(csv.DictReader(open(sys.argv[1])))
pts = json.load(open(sys.argv[2]))["points"]
assert len(rows) == 9 == len(pts), len(rows)
for r, p in zip(rows, pts):
    for k in ["gap_nm", "bias_V", "current_A", "decay_constant_per_nm"]:
        assert float(r[k]) == p[k], (k, r[k], p[k])
    assert r["regime"] == p["regime"]
print("grid ok")
PYEOF

# Table has units in its headers; --output writes atomically and prints nothing.
"$T" predict --gap 0.6nm --bias 0.1V | grep -q 'gap \[nm\]' || fail "table header units"
out=$("$T" predict --gap 0.6nm --bias 0.1V --format json --output "$tmp/o.json")
[ -z "$out" ] || fail "--output printed to stdout"
cmp <("$T" predict --gap 0.6nm --bias 0.1V --format json) "$tmp/o.json" || fail "--output content"

# Exit codes: usage 2, bad input 3. Messages are one line naming the option.
set +e
"$T" predict --gap 0.6 --bias 0.1V 2> "$tmp/e1"; rc1=$?
"$T" predict --gap 0.6nm --bias 0.1V --bogus 2> "$tmp/e2"; rc2=$?
"$T" predict --gap -0.1nm --bias 0.1V 2> "$tmp/e3"; rc3=$?
"$T" predict --gap 0.6nm --bias 50V 2> "$tmp/e4"; rc4=$?
set -e
[ $rc1 -eq 3 ] || fail "unitless gap exit $rc1"
grep -qx "tipgap: error: --gap: '0.6' has no unit; expected a length in m, cm, mm, um, nm, Å (or A), pm" "$tmp/e1" || fail "msg1: $(cat $tmp/e1)"
[ $rc2 -eq 2 ] || fail "unknown option exit $rc2"
[ $rc3 -eq 3 ] || fail "negative gap exit $rc3"
grep -q -- "--gap: the gap must be positive" "$tmp/e3" || fail "msg3: $(cat $tmp/e3)"
[ $rc4 -eq 3 ] || fail "bias limit exit $rc4"
grep -q -- "--bias: |bias| 50 V exceeds the configured bias_limit of 10 V" "$tmp/e4" || fail "msg4: $(cat $tmp/e4)"

# Warnings: near contact and field emission are printed on stderr and listed in JSON.
"$T" predict --gap 0.3nm --bias 0.1V --format json 2> "$tmp/w1" > "$tmp/w1.json"
grep -q "near contact" "$tmp/w1" || fail "near-contact warning"
"$T" predict --gap 3nm --bias 7V --format json 2> "$tmp/w2" > /dev/null
grep -q "field-emission regime" "$tmp/w2" || fail "field-emission warning"
echo "1 passed, 0 failed"
