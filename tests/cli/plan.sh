#!/usr/bin/env bash
# tipgap plan: real numbers from the JSON output, the round trip through predict, warnings and exit
# codes (0 ok, 3 bad input, 4 no answer).
set -u
PY=${TIPGAP_PYTHON:-/usr/bin/python3}
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
fail() { echo "FAIL: $*" >&2; exit 1; }

# 1 nA at 0.1 V with the built-in junction (tungsten over gold, planar 1 nm^2).
"$TIPGAP" plan --current 1nA --bias 0.1V --format json > "$work/plan.json" || fail "plan exited $?"
"$PY" - "$work/plan.json" <<'PYEOF' || fail "plan JSON checks"
import json, math, sys
d = json.load(open(sys.argv[1]))
p = d["points"]
assert len(p) == 1, p
p = p[0]
for key in ("bias_V", "current_A", "gap_nm", "gap_resistance_ohm", "conductance_G0", "nm_per_decade",
            "apparent_barrier_eV", "regime", "warnings"):
    assert key in p, key
assert p["bias_V"] == 0.1 and p["current_A"] == 1e-9
# R = V/I = 1e8 ohm and G = I/(V G0), G0 = 2e^2/h = 7.748091729e-5 S (CODATA 2018): to 1e-6, the
# model tolerance of the default configuration.
assert abs(p["gap_resistance_ohm"] / 1e8 - 1) < 1e-6, p["gap_resistance_ohm"]
assert abs(p["conductance_G0"] * 7.748091729e-5 * 1e8 - 1) < 1e-6, p["conductance_G0"]
# Physical sizes (common practice, no source): a metal gap at 100 MOhm is a few tenths of a nm, and
# the current changes tenfold per ~0.1 nm with an apparent barrier of a few eV.
assert 0.5 < p["gap_nm"] < 1.0, p["gap_nm"]
assert 0.08 < p["nm_per_decade"] < 0.14, p["nm_per_decade"]
assert 3.0 < p["apparent_barrier_eV"] < 5.5, p["apparent_barrier_eV"]
assert p["regime"] == "direct_tunnelling" and p["warnings"] == [], p
open(sys.argv[1] + ".gap", "w").write(repr(p["gap_nm"]))
PYEOF

# Round trip: predict at the planned gap returns the setpoint. The default model tolerance is 1e-6,
# so the current comes back to that (the 1e-9 round trip at a tight tolerance is a library test).
gap=$(cat "$work/plan.json.gap")
"$TIPGAP" predict --gap "${gap}nm" --bias 0.1V --format json > "$work/predict.json" || fail "predict exited $?"
"$PY" -c "
import json, sys
I = json.load(open('$work/predict.json'))['points'][0]['current_A']
assert abs(I / 1e-9 - 1) < 1e-6, I
" || fail "round trip"

# z(V) trace: 5 biases, the gap grows with the bias at constant current.
"$TIPGAP" plan --current 100pA --bias 0.2V..1.0V --points 5 --format json > "$work/trace.json" || fail "trace exited $?"
"$PY" -c "
import json
p = json.load(open('$work/trace.json'))['points']
assert [round(x['bias_V'], 12) for x in p] == [0.2, 0.4, 0.6, 0.8, 1.0], p
g = [x['gap_nm'] for x in p]
assert all(b > a for a, b in zip(g, g[1:])), g
" || fail "trace"

# A ladder with one unreachable rung: exit 0, the rung has a null gap and the unreachable warning.
"$TIPGAP" plan --current 1nA,1A --bias 0.1V --format json > "$work/ladder.json" 2> "$work/ladder.err" || fail "ladder exited $?"
"$PY" -c "
import json
p = json.load(open('$work/ladder.json'))['points']
assert p[0]['gap_nm'] is not None and p[1]['gap_nm'] is None, p
assert p[1]['status'] == 'current_too_high', p[1]
assert p[1]['warnings'] == ['unreachable: the current cannot be reached in the physical gap range 0.1..5 nm; even the closest gap gives less; lower the setpoint or raise the bias magnitude'], p[1]
" || fail "ladder"
grep -q "tipgap: warning: 1 A at 0.1 V: unreachable" "$work/ladder.err" || fail "ladder warning on stderr"

# Near contact: 1 uA at 10 mV is 1.3 G0.
"$TIPGAP" plan --current 1uA --bias 10mV --format json > "$work/near.json" 2>/dev/null || fail "near exited $?"
"$PY" -c "
import json
p = json.load(open('$work/near.json'))['points'][0]
assert p['conductance_G0'] > 0.01 and p['warnings'][0].startswith('near contact: gap '), p
" || fail "near contact"

# No answer anywhere: exit 4 and the reason on stderr.
"$TIPGAP" plan --current 1A --bias 0.1V > /dev/null 2> "$work/none.err"
rc=$?
[ $rc -eq 4 ] || fail "unreachable setpoint: exit $rc, expected 4"
[ "$(cat "$work/none.err")" = "tipgap: no answer: 1 A at 0.1 V: unreachable: the current cannot be reached in the physical gap range 0.1..5 nm; even the closest gap gives less; lower the setpoint or raise the bias magnitude" ] || fail "no-answer message: $(cat "$work/none.err")"

# Bad input: exit 3.
"$TIPGAP" plan --current 1nA --bias 0V > /dev/null 2> "$work/bad.err"
rc=$?
[ $rc -eq 3 ] || fail "zero bias: exit $rc, expected 3"
grep -q "^tipgap: error: --bias: a current setpoint needs a non-zero bias" "$work/bad.err" || fail "zero-bias message"
"$TIPGAP" plan --current 1nm --bias 0.1V > /dev/null 2>&1
rc=$?
[ $rc -eq 3 ] || fail "current with a length unit: exit $rc, expected 3"
"$TIPGAP" plan --current 1nA --bias 0.1V --plot "$work/x.bmp" > /dev/null 2>&1
rc=$?
[ $rc -eq 3 ] || fail "bad plot extension: exit $rc, expected 3"
[ ! -e "$work/x.bmp" ] || fail "bad plot extension left a file"

# Plots: PNG signature and an SVG that parses as XML.
"$TIPGAP" plan --current 1nA --bias 0.1V..1V --points 3 --plot "$work/trace.png" > /dev/null || fail "png plot"
[ "$(head -c 8 "$work/trace.png" | od -An -tx1 | tr -d ' \n')" = "89504e470d0a1a0a" ] || fail "PNG signature"
"$TIPGAP" plan --current 1nA --bias 0.1V --plot "$work/one.svg" > /dev/null || fail "svg plot"
"$PY" -c "import sys, xml.dom.minidom as m; assert m.parse(sys.argv[1]).documentElement.tagName == 'svg'" "$work/one.svg" || fail "SVG parse"
echo "plan CLI: ok"
