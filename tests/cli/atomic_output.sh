#!/usr/bin/env bash
# Outputs are all-or-nothing: a command killed with SIGKILL at any moment leaves its target either
# absent (or the old file, when there was one) or complete, and whatever temporary it leaves behind
# is a hidden ".<name>.tmp-<pid>-<n>" sibling that cannot be taken for the output.
#
# Each scenario runs the command once to completion (to learn how long it takes and what a complete
# output looks like), then starts it again and kills it at fractions of that time, so that kills
# land while computing, while writing the temporary and around the rename.
#
# To cover a new command, add a scenario at the end: a name, a function that says whether a target
# is a complete output of that command, and the command line ending in the option that takes the
# target (the target path is appended). A directory output (the grid `map`) works the same way:
# the check function gets the directory.
# Env: TIPGAP (executable).
set -euo pipefail
: "${TIPGAP:?}"
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
fail() { echo "FAIL: $*" >&2; exit 1; }

# Kill points as fractions of the measured run time (in percent).
kill_percents="${TIPGAP_KILL_PERCENTS:-10 50 80 90 95 98 100 103}"

now_ns() { date +%s%N; }

# Every entry in the target's directory other than the target itself must be a hidden temporary
# of the target: ".<name>.tmp-<pid>-<n>" (file or directory).
check_siblings() {
  local dir=$1 name=$2 entry base
  for entry in "$dir"/* "$dir"/.[!.]*; do
    [ -e "$entry" ] || continue
    base=$(basename "$entry")
    [ "$base" = "$name" ] && continue
    [[ "$base" =~ ^\.${name//./\\.}\.tmp-[0-9]+-[0-9]+$ ]] \
      || fail "unexpected file '$base' beside $name (a temporary that looks like output?)"
  done
}

# run_scenario NAME CHECK_FN OLD -- command with "$target"...
#   CHECK_FN <path> returns 0 when <path> is a complete output.
#   OLD: the old target put in place before each killed run: "" = none, "dir:<path>" = a copy of
#   the directory <path>, anything else = a file with that text.
run_scenario() {
  local name=$1 check=$2 old=$3
  shift 4
  local dir="$tmp/$name" target
  mkdir -p "$dir/full"
  if [[ "$old" == dir:* ]]; then cp -r "${old#dir:}" "$dir/old"; else printf '%s' "$old" > "$dir/old"; fi
  target="$dir/full/out"
  local t0 t1
  t0=$(now_ns)
  "$@" "$target" > /dev/null 2> "$dir/full.err" || fail "$name: the uninterrupted run failed: $(cat "$dir/full.err")"
  t1=$(now_ns)
  "$check" "$target" || fail "$name: the uninterrupted run's output fails its own completeness check"
  check_siblings "$dir/full" out
  local total_ms=$(( (t1 - t0) / 1000000 ))
  echo "$name: a full run takes $total_ms ms"
  local p run outcome kept=0 complete=0 absent=0
  for p in $kill_percents; do
    run="$dir/kill-$p"
    mkdir -p "$run"
    target="$run/out"
    [ -z "$old" ] || cp -r "$dir/old" "$target"
    "$@" "$target" > /dev/null 2>&1 &
    local pid=$!
    sleep "$(awk -v ms="$total_ms" -v p="$p" 'BEGIN { printf "%.3f", ms * p / 100000 }')"
    kill -KILL "$pid" 2> /dev/null || true
    wait "$pid" 2> /dev/null || true
    if [ ! -e "$target" ]; then
      [ -z "$old" ] || fail "$name: killed at $p%: the old output vanished"
      outcome=absent; absent=$((absent + 1))
    elif [ -n "$old" ] && diff -r "$target" "$dir/old" > /dev/null 2>&1; then
      outcome=old; kept=$((kept + 1))
    elif "$check" "$target"; then
      outcome=complete; complete=$((complete + 1))
    else
      fail "$name: killed at $p%: the target exists but is neither the old output nor complete"
    fi
    check_siblings "$run" out
    echo "  killed at $p% of the run: $outcome"
  done
  echo "$name: $((kept + absent)) kills left the old state, $complete a complete output, none a partial one"
}

# --- predict --output: a CSV of header + one row per (gap, bias) point, complete when it has them
# all and ends with a newline.
points=60
predict_rows=$((points * points + 1))
predict_complete() {
  local f=$1
  [ -f "$f" ] || return 1
  [ "$(tail -c 1 "$f" | od -An -c | tr -d ' ')" = '\n' ] || return 1
  [ "$(wc -l < "$f")" -eq "$predict_rows" ] || return 1
  head -n 1 "$f" | grep -q '^gap_nm,bias_V,'
}
old_text=$'old complete output\n'
run_scenario predict_new predict_complete "" -- \
  "$TIPGAP" predict --gap 0.3nm..2nm --bias -2V..2V --points "$points" --format csv --threads 2 --output
run_scenario predict_replace predict_complete "$old_text" -- \
  "$TIPGAP" predict --gap 0.3nm..2nm --bias -2V..2V --points "$points" --format csv --threads 2 --output

# --- fit --output: the JSON report of one curve, complete when it parses.
curve="$tmp/curve.csv"
{
  echo "# synthetic curve"
  echo "z [nm],current [nA]"
  awk 'BEGIN { for (k = 0; k < 2000; ++k) { z = k * 0.0005; printf "%.4f,%.6g\n", z, exp(-20 * z) } }'
} > "$curve"
fit_complete() {
  [ -f "$1" ] && "${TIPGAP_PYTHON:-/usr/bin/python3}" -c 'import json,sys; json.load(open(sys.argv[1]))' "$1" 2> /dev/null
}
run_scenario fit_replace fit_complete "$old_text" -- "$TIPGAP" fit "$curve" --format json --output

# --- map --output-dir: a directory of maps, complete when every file is there and summary.json
# parses; killed runs must leave no partial directory, and an old output directory whole.
grid="$tmp/grid.csv"
"$TIPGAP" synth --grid 160x160 --points-per-curve 128 --out "$grid" > /dev/null
map_files="apparent_barrier_eV.csv barrier_histogram.png barrier_map.png decay_constant_per_nm.csv quality.csv
quality_map.png stderr_apparent_barrier_eV.csv stderr_map.png summary.json"
map_complete() {
  local d=$1 f
  [ -d "$d" ] || return 1
  for f in $map_files; do [ -s "$d/$f" ] || return 1; done
  [ "$(ls -A "$d" | wc -l)" -eq "$(echo $map_files | wc -w)" ] || return 1
  "${TIPGAP_PYTHON:-/usr/bin/python3}" -c 'import json,sys; json.load(open(sys.argv[1]))' "$d/summary.json" 2> /dev/null
}
"$TIPGAP" map "$grid" --output-dir "$tmp/old_map" --threads 2 --quiet > /dev/null
run_scenario map_new map_complete "" -- "$TIPGAP" map "$grid" --threads 2 --quiet --output-dir
run_scenario map_replace map_complete "dir:$tmp/old_map" -- "$TIPGAP" map "$grid" --threads 2 --quiet --output-dir

echo "atomic outputs: all scenarios passed"
