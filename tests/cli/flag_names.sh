#!/usr/bin/env bash
# The one table from library keys to flag names (cli/flags.cpp): the library checks each option
# once and names its field; the CLI's message names the flag, exactly, with the exit code of the
# error's kind (2 for an option value, 3 for an operating point the model refuses). The same
# library key can be two flags: fit_options::current_noise_A is --current-noise, and
# synth_options::current_noise_A is --noise.
# Env: TIPGAP (executable), TIPGAP_SOURCE_DIR.
set -euo pipefail
: "${TIPGAP:?}" "${TIPGAP_SOURCE_DIR:?}"
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
curve="$TIPGAP_SOURCE_DIR/demo_scans/01_w_au111_clean.csv"
failures=0

# expect EXIT MESSAGE ARGS...: stderr is exactly MESSAGE, the exit code EXIT, stdout empty.
expect() {
  local want_rc=$1 want=$2 rc=0
  shift 2
  "$TIPGAP" "$@" > "$tmp/out" 2> "$tmp/err" || rc=$?
  if [ "$rc" -ne "$want_rc" ] || [ "$(cat "$tmp/err")" != "$want" ] || [ -s "$tmp/out" ]; then
    echo "FAIL: tipgap $*"; echo "  exit $rc (want $want_rc)"; echo "  got:  $(cat "$tmp/err")"; echo "  want: $want"
    failures=$((failures + 1))
  fi
}

expect 2 "tipgap: usage error: --current-noise: -1e-12 A is out of range; expected a current >= 0 (0 = estimate)" \
  fit "$curve" --current-noise -1pA
expect 2 "tipgap: usage error: --noise: must be from 0 to 0.001 A" synth --out "$tmp/s.csv" --noise -1pA
expect 2 "tipgap: usage error: --confidence: 1.5 is out of range; expected a level in [0.5, 0.9999], e.g. 0.95" \
  map "$tmp/no_grid.csv" --output-dir "$tmp/m" --confidence 1.5
expect 2 "tipgap: usage error: --min-decades: must be > 0" map "$tmp/no_grid.csv" --output-dir "$tmp/m" --min-decades 0
expect 2 "tipgap: usage error: --threads: must be >= 0 (0 = all cores)" map "$tmp/no_grid.csv" --output-dir "$tmp/m" --threads -1
expect 2 "tipgap: usage error: --drift: piezo drift is not supported in grid mode" \
  synth --out "$tmp/g.csv" --grid 2x2 --drift 0.01nm
expect 3 "tipgap: error: --bias: |bias| 20 V exceeds the configured bias_limit; expected |bias| <= 10 V (raise bias_limit in the configuration to go further)" \
  predict --gap 0.6nm --bias 20V
expect 3 "tipgap: error: --bias: a current setpoint needs a non-zero bias with |bias| <= the bias_limit of 10 V (got 0 V)" \
  plan --current 1nA --bias 0V
# Nothing of a refused run is left behind.
leftovers=$(ls -A "$tmp" | grep -v -x -e out -e err || true)
[ -z "$leftovers" ] || { echo "FAIL: refused runs left $leftovers"; failures=$((failures + 1)); }
[ "$failures" -eq 0 ] || exit 1
echo "flag_names: ok"
