#!/usr/bin/env bash
# The junction flags shared by predict, plan, table, synth and resonances (cli/junction.cpp over
# tipgap::apply_overlay), --show-config, and bias sweeps through 0 V with --step and dz_nm.
set -u
PY=${TIPGAP_PYTHON:-/usr/bin/python3}
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
fail() { echo "FAIL: $*" >&2; exit 1; }

# 1. A config holding only the temperature works and equals --temperature.
printf 'temperature: 300 K\n' > "$work/t.yaml"
"$TIPGAP" plan --current 1nA --bias 0.1V -c "$work/t.yaml" --format csv > "$work/file.csv" || fail "config with only temperature"
"$TIPGAP" plan --current 1nA --bias 0.1V --temperature 300K --format csv > "$work/flag.csv" || fail "--temperature"
cmp -s "$work/file.csv" "$work/flag.csv" || fail "config 'temperature: 300 K' differs from --temperature 300K"
"$TIPGAP" plan --current 1nA --bias 0.1V --format csv > "$work/default.csv" || fail "default"
cmp -s "$work/file.csv" "$work/default.csv" && fail "300 K gives the 4.2 K answer"

# 2. --tip W --sample Au is tungsten/gold, which is the default; every command takes the flags.
for cmd in "predict --gap 0.7nm --bias 0.1V" "plan --current 1nA --bias 0.1V" "table --samples gold,graphite"; do
  $TIPGAP $cmd --format csv > "$work/a.csv" || fail "$cmd"
  $TIPGAP $cmd --tip W --sample Au --format csv > "$work/b.csv" || fail "$cmd --tip W --sample Au"
  $TIPGAP $cmd --tip tungsten --sample GOLD --format csv > "$work/c.csv" || fail "$cmd --tip tungsten --sample GOLD"
  cmp -s "$work/a.csv" "$work/b.csv" && cmp -s "$work/a.csv" "$work/c.csv" || fail "$cmd: W/Au is not the default"
done
"$TIPGAP" plan --current 1nA --bias 0.1V --tip PtIr --sample HOPG --image none --method simmons --tip-work-function 5.0eV \
  --format json > "$work/o.json" || fail "overrides"
"$PY" - "$work/o.json" <<'PYEOF' || fail "overrides JSON"
import json, sys
c = json.load(open(sys.argv[1]))["config"]
assert c["tip"]["material"] == "platinum_iridium" and abs(c["tip"]["work_function_eV"] - 5.0) < 1e-12, c
assert c["sample"]["material"] == "graphite" and abs(c["sample"]["work_function_eV"] - 4.6) < 1e-12, c
assert c["image_potential"] == "none" and c["method"] == "simmons", c
assert c["source"] == "<default> + command line", c
PYEOF
"$TIPGAP" table --sample HOPG --format csv | tail -n +2 | cut -d, -f1 | grep -qx graphite || fail "table --sample"
"$TIPGAP" synth --out "$work/s.csv" --tip Pt --temperature 77K > /dev/null || fail "synth --tip"
grep -q "work_function_eV: 5.65" "$work/s.truth.yaml" || grep -q "5.65" "$work/s.truth.yaml" || fail "synth --tip Pt"

# 3. --show-config: YAML that reads back as the same config, each value's origin, exit 0, without
#    the command's required flags.
"$TIPGAP" plan -c "$work/t.yaml" --tip Au --show-config > "$work/shown.yaml" || fail "--show-config exited $?"
grep -qx "temperature: 300 K  # $work/t.yaml:1" "$work/shown.yaml" || { cat "$work/shown.yaml"; fail "file origin"; }
grep -qx "  material: gold  # command line (--tip)" "$work/shown.yaml" || fail "command-line origin"
"$TIPGAP" plan --tip W --tip-work-function 4.4eV --temperature 77K --image none --show-config > "$work/flags.yaml" || fail "--show-config flags"
grep -qx "  material: tungsten  # command line (--tip)" "$work/flags.yaml" || { cat "$work/flags.yaml"; fail "--tip origin"; }
grep -qx "  work_function: 4.4 eV  # command line (--tip-work-function)" "$work/flags.yaml" || fail "--tip-work-function origin"
grep -qx "temperature: 77 K  # command line (--temperature)" "$work/flags.yaml" || fail "--temperature origin"
grep -qx "  image_potential: none  # command line (--image)" "$work/flags.yaml" || fail "--image origin"
grep -qx "method: wkb  # built-in default" "$work/shown.yaml" || fail "default origin"
"$TIPGAP" plan --current 1nA --bias 0.1V -c "$work/shown.yaml" --format csv > "$work/r.csv" || fail "shown config reads back"
"$TIPGAP" plan --current 1nA --bias 0.1V -c "$work/t.yaml" --tip Au --format csv > "$work/o.csv" || fail "flags"
cmp -s "$work/r.csv" "$work/o.csv" || fail "the shown config is not the same config"

# 4. Bad values name their flag (usage error, exit 2).
"$TIPGAP" plan --current 1nA --bias 0.1V --tip unobtainium > /dev/null 2> "$work/e"; rc=$?
[ $rc -eq 2 ] && grep -q "^tipgap: usage error: --tip: unknown material 'unobtainium'" "$work/e" || { cat "$work/e"; fail "bad --tip: $rc"; }
"$TIPGAP" plan --current 1nA --bias 0.1V --temperature=-5K > /dev/null 2> "$work/e"; rc=$?
[ $rc -eq 2 ] && grep -q "^tipgap: usage error: --temperature:" "$work/e" || { cat "$work/e"; fail "bad --temperature: $rc"; }
"$TIPGAP" plan --current 1nA --bias 0.1V --method fast > /dev/null 2> "$work/e"; rc=$?
[ $rc -eq 2 ] && grep -q "^tipgap: usage error: --method: 'fast' is not a method; expected" "$work/e" || { cat "$work/e"; fail "bad --method"; }

# 5. A -3..3 V trace of 61 points answers 60 and keeps 0 V (null gap, note, exit 0); --step gives
#    the same biases; dz_nm is zero at the reference bias.
"$TIPGAP" plan --current 100pA --bias=-3V..3V --points 61 --format json > "$work/zv.json" 2> "$work/zv.err" || fail "zv trace exited $?"
grep -q "^tipgap: note: 0 V:" "$work/zv.err" || fail "zero-bias note"
"$TIPGAP" plan --current 100pA --bias=-3V..3V --step 0.1V --format json > "$work/zv2.json" 2> /dev/null || fail "--step"
"$TIPGAP" plan --current 100pA --bias=-3V..3V --step 0.1V --reference-bias 1V --format csv > "$work/zv3.csv" 2> /dev/null || fail "--reference-bias"
"$PY" - "$work/zv.json" "$work/zv2.json" "$work/zv3.csv" <<'PYEOF' || fail "zv JSON"
import csv, json, sys
a = json.load(open(sys.argv[1]))["points"]
b = json.load(open(sys.argv[2]))["points"]
assert len(a) == 61 and [p["bias_V"] for p in a] == [p["bias_V"] for p in b], (len(a), len(b))
zero = [p for p in a if p["bias_V"] == 0]
assert len(zero) == 1 and zero[0]["gap_nm"] is None and zero[0]["status"] == "zero_bias" and zero[0]["note"], zero
answered = [p for p in a if p["gap_nm"] is not None]
assert len(answered) == 60, len(answered)
assert a[0]["dz_nm"] == 0 and all(abs(p["dz_nm"] - (p["gap_nm"] - a[0]["gap_nm"])) < 1e-12 for p in answered)
rows = list(csv.DictReader(open(sys.argv[3])))
one = [r for r in rows if float(r["bias_V"]) == 1.0][0]
assert float(one["dz_nm"]) == 0.0, one
z = [r for r in rows if float(r["bias_V"]) == 0.0][0]
assert z["gap_nm"] == "" and z["status"] == "zero_bias", z
PYEOF
"$TIPGAP" plan --current 100pA --bias=-3V..3V --step 0.7V > /dev/null 2> "$work/e"; rc=$?
[ $rc -eq 2 ] && grep -q "^tipgap: usage error: --step: '0.7V' does not divide" "$work/e" || { cat "$work/e"; fail "bad --step: $rc"; }
# The table marks 0 V and shows readable units with the sign of the current.
"$TIPGAP" plan --current 100pA --bias=-1V..1V --points 3 > "$work/zv.txt" 2> /dev/null || fail "zv table"
grep -q "I \[pA\]" "$work/zv.txt" || fail "current in pA"
grep -qE "^ *-1\.000 +-100\.0 " "$work/zv.txt" || { cat "$work/zv.txt"; fail "signed current at negative bias"; }
grep -qE "zero bias" "$work/zv.txt" || fail "0 V row"
echo "junction CLI: ok"
