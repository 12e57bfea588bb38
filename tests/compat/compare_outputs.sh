#!/usr/bin/env bash
# Behaviour check for refactors: runs the same commands with two tipgap executables (OLD and NEW)
# on configs/ and demo_scans/ and compares, byte for byte, what each writes: standard output,
# standard error, the exit code, and every file it creates (tables, CSV, JSON, YAML, SVG; PNG files by
# their decoded pixels).
#   tests/compat/compare_outputs.sh OLD_EXE NEW_EXE
# Timings ("in 1.9 s", JSON keys ending in _s or _per_s) are blanked before the comparison.
# Prints one line per command and "N passed, N failed" at the end; exit 1 on any difference.
# Not run by ctest: it needs an executable built from an older commit.
set -uo pipefail
old=$(readlink -f "$1"); new=$(readlink -f "$2")
src=$(cd "$(dirname "$0")/../.." && pwd)
work=$(mktemp -d); trap 'rm -rf "$work"' EXIT
scans="$src/demo_scans"; cfg="$src/configs"

cmds=(
  "predict --gap 0.6nm --bias 0.1V"
  "predict --gap 0.4nm..1.2nm --bias 0.1V,1V,-0.5V --points 9 --format csv"
  "predict --gap 0.4nm..1.2nm --bias 0.1V --points 5 --format json"
  "predict --config $cfg/example.yaml --gap 0.5nm,0.7nm --bias 0.2V --mc-samples 40"
  "predict --config $cfg/example.yaml --gap 0.5nm,0.7nm --bias 0.2V --mc-samples 40 --format csv"
  "predict --config $cfg/example.yaml --gap 0.6nm --bias -0.3V --mc-samples 0 --format json"
  "predict --gap 0.3nm..2nm --bias 0.1V..3V --points 7 --plot out/p.svg --format csv -o out/p.csv"
  "predict --gap 0.2nm --bias 8V"
  "plan --current 1nA --bias 0.1V"
  "plan --current 10pA..10nA --bias 0.5V --points 7 --format csv"
  "plan --current 1nA --bias 0.5V..4V --points 8 --format json"
  "plan --current 1nA --bias -2V..2V --points 6 --plot out/z.svg -o out/z.txt"
  "plan --config $cfg/example.yaml --current 100pA,1nA --bias 0.2V --mc-samples 30"
  "plan --config $cfg/example.yaml --current 100pA --bias 0.2V --mc-samples 30 --format json"
  "plan --current 1uA --bias 0.01V"
  "plan --current 1nA --bias 9V"
  "table"
  "table --format csv"
  "table --samples gold,graphite --current 100pA --bias 0.5V --format json"
  "fit $scans/01_w_au111_clean.csv"
  "fit $scans/01_w_au111_clean.csv $scans/02_w_au111_floor.csv $scans/03_w_au111_saturated.csv --format csv"
  "fit $scans/04_w_au111_contact.csv $scans/05_w_au111_pair.csv --format json"
  "fit $scans/06_contaminated_au111.csv $scans/07_w_graphite.csv --model offset"
  "fit $scans/02_w_au111_floor.csv --config default --format json"
  "fit $scans/05_w_au111_pair.csv --config default"
  "fit $scans/01_w_au111_clean.csv --window 0.1nm --calibration-uncertainty 0.02 --confidence 0.9 --format json"
  "fit $scans/05_w_au111_pair.csv --plot out/f.svg --output out/f.json --format json"
  "fit $scans/missing.csv"
  "synth --out out/s.csv --noise 1pA --seed 7 --sweeps approach_retract --baseline 0.3pA --saturation 5nA"
  "synth --out out/g.csv --grid 6x5 --points-per-curve 40 --noise 1pA --seed 3"
  "map out/g.csv --output-dir out/gmap --threads 1 --quiet"
  "map out/g.csv --threads 2 --model offset"
  "demo --out out/demo --scans $scans --threads 2"
  "predict --gap 0.6nm --bias 0V"
  "plan --current 1nA"
)

run_one() {  # exe dir cmd
  local exe=$1 dir=$2; shift 2
  mkdir -p "$dir/out"
  (cd "$dir" && eval "\"$exe\" $*" >stdout 2>stderr; echo $? > rc)
  # The executable's own path appears in CLI11 usage lines; make it neutral.
  sed -i "s|$exe|tipgap|g" "$dir/stdout" "$dir/stderr"
  # Wall-clock figures differ from run to run: keep their place, drop their value.
  find "$dir" -type f \( -name 'std*' -o -name '*.json' \) -print0 |
    xargs -0 sed -i -E 's/ in [0-9.]+ s/ in T s/g; s/("[A-Za-z_]*(_s|_per_s)": )[0-9.e+-]+/\1T/'
}

pass=0; fail=0
for i in "${!cmds[@]}"; do
  c=${cmds[$i]}
  # synth/map/demo steps share files: run the whole list in one directory per executable.
  run_one "$old" "$work/old" "$c"
  run_one "$new" "$work/new" "$c"
  for d in old new; do (cd "$work/$d" && mv stdout "stdout.$i" && mv stderr "stderr.$i" && mv rc "rc.$i"); done
  # PNG files are compared by their decoded pixels (png_pixels.py), not by their compression.
  rm -rf "$work/cmp"; mkdir -p "$work/cmp"; cp -r "$work/old" "$work/new" "$work/cmp/"
  /usr/bin/python3 "$src/tests/compat/png_pixels.py" "$work/cmp"
  if diff -r -q "$work/cmp/old" "$work/cmp/new" >"$work/diff.txt" 2>&1; then
    pass=$((pass + 1)); echo "same      $c"
  else
    fail=$((fail + 1)); echo "DIFFERENT $c"; sed 's/^/    /' "$work/diff.txt" | head -5
  fi
done
echo "$pass passed, $fail failed"
[ "$fail" -eq 0 ]
