#!/usr/bin/env bash
# Issue 11, classes 4, 5, 6, 7 and 8: bounded reads, any bytes in text, edge values, no NaN or inf
# behind exit 0, and messages a user can act on. Each check names its class.
# Env: TIPGAP (executable), TIPGAP_SOURCE_DIR (the repository).
set -uo pipefail
: "${TIPGAP:?}" "${TIPGAP_SOURCE_DIR:?}"
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
cd "$tmp"
fails=0
fail() { echo "FAIL: $*" >&2; fails=$((fails + 1)); }
curve="$TIPGAP_SOURCE_DIR/demo_scans/01_w_au111_clean.csv"

# expect CODE PATTERN -- command...: exit code, and a stderr matching PATTERN with no internal name.
expect() {
  local code=$1 pattern=$2
  shift 3
  timeout 20 "$@" > out.txt 2> err.txt
  local rc=$?
  [ "$rc" = "$code" ] || { fail "$*: exit $rc, expected $code; stderr: $(head -c 300 err.txt)"; return 1; }
  [ -z "$pattern" ] || grep -qE -- "$pattern" err.txt || { fail "$*: stderr lacks /$pattern/: $(head -c 300 err.txt)"; return 1; }
  grep -qE '_(m|A|V|J|K)\b' err.txt && { fail "$*: an internal name in: $(cat err.txt)"; return 1; }
  return 0
}
# with_meta LINE: the demo curve with LINE added after its metadata.
with_meta() { head -n 3 "$curve"; printf '%s\n' "$1"; tail -n +4 "$curve"; }

# --- 4. Bounded reads: each ends with a clear error (timeout 10 only guards against a hang; the
# time itself is not tested: about 0.3 s on an idle machine, README "Limits")
for args in "predict --config /dev/zero --gap 1nm --bias 0.1V" "fit /dev/zero" "resonances /dev/zero" "map /dev/zero"; do
  # shellcheck disable=SC2086
  expect 3 "at most|not a regular file" -- timeout 10 "$TIPGAP" $args
done
head -c 2000000 /dev/zero | tr '\0' '#' > big.yaml
expect 3 "at most 1 MiB" -- "$TIPGAP" predict --config big.yaml --gap 1nm --bias 0.1V

# --- 5. Any bytes in text: JSON stays valid, labels cannot add metadata lines
bad_name=$(printf 'bad\xff\xfename.csv')
cp "$curve" "$bad_name"
expect 0 "" -- "$TIPGAP" fit "$bad_name" --format json
/usr/bin/python3 -c 'import json, sys; d = json.load(open(sys.argv[1])); assert d["invalid_utf8_replaced"] is True; assert "\ufffd" in d["curves"][0]["file"]' out.txt \
  || fail "5: fit JSON of a non-UTF-8 file name is not valid or not flagged"
with_meta "$(printf '# sample: Au\xff(111)')" | sed '/^# sample: Au(111)$/d' > latin1.csv
expect 0 "" -- "$TIPGAP" fit latin1.csv --format json
/usr/bin/python3 -c 'import json, sys; json.load(open(sys.argv[1]))' out.txt || fail "5: fit JSON with a non-UTF-8 label is not valid"
expect 0 "" -- "$TIPGAP" synth --sample-label "$(printf 'Au\n# bias: 5 V')" --tip-label "$(printf 'W\r# seed: 9')" --out labels.csv
[ "$(grep -c '^# bias:' labels.csv)" = 1 ] || fail "5: a label added a '# bias:' line: $(head -12 labels.csv)"
[ "$(grep -c '^# seed:' labels.csv)" = 1 ] || fail "5: a label added a '# seed:' line"
expect 0 "" -- "$TIPGAP" fit labels.csv
grep -q '0.1 V' labels.csv || fail "5: the bias line is gone"

# --- 6. Edge values
expect 2 "does not rise" -- "$TIPGAP" synth --gap 1nm..0.5nm --out s.csv
expect 2 "spans .* pm; expected at least" -- "$TIPGAP" synth --gap 0.5nm..0.5001nm --out s.csv
expect 2 "confidence" -- "$TIPGAP" fit "$curve" --confidence 1
expect 2 "confidence" -- "$TIPGAP" fit "$curve" --confidence 0.1
expect 2 "seed" -- "$TIPGAP" synth --seed 18446744073709551616 --out s.csv
[ ! -e s.csv ] || fail "6: a refused synth left s.csv"
# an inclusive limit: 100 nm against (0, 100] nm is accepted
expect 0 "" -- "$TIPGAP" predict --gap 100nm --bias 0.1V --mc-samples 0

# --- 7. No NaN or inf behind exit 0
expect 4 "cannot be reached" -- "$TIPGAP" table --current 1e6A
grep -qi nan out.txt && fail "7: table printed nan"
with_meta "# bias: 1e300 V" | sed '/^# bias: 0.1 V/d' > huge_bias.csv
expect 3 "bias.*out of range" -- "$TIPGAP" fit huge_bias.csv
with_meta "# bias: 0.2 V" > twice.csv
expect 3 "given twice" -- "$TIPGAP" fit twice.csv
expect 2 "noise" -- "$TIPGAP" synth --noise 1e300A --out s.csv
(cat "$TIPGAP_SOURCE_DIR/configs/default.yaml"; printf -- '---\ntemperature: 77 K\n') > two_docs.yaml
expect 3 "second YAML document" -- "$TIPGAP" predict --config two_docs.yaml --gap 1nm --bias 0.1V
"$TIPGAP" synth --grid 6x6 --points-per-curve 32 --noise 1e-3A --out noisy_grid.csv > /dev/null 2>&1 || fail "7: synth grid"
expect 4 "no pixel could be fitted" -- "$TIPGAP" map noisy_grid.csv --output-dir noisy_map
[ ! -e noisy_map ] || fail "7: a map of blanks was written"

# --- 8. Look-alike characters in units are accepted; others are named by code point
nbsp=$(printf '\xc2\xa0') kelvin=$(printf '\xe2\x84\xaa') angstrom=$(printf '\xe2\x84\xab') minus=$(printf '\xe2\x88\x92')
expect 0 "" -- "$TIPGAP" predict --gap "0.6${nbsp}nm" --bias "${minus}100 mV" --mc-samples 0 --format csv
grep -q -- '-0.1' out.txt || fail "8: U+2212 MINUS SIGN was not read as a minus"
expect 0 "" -- "$TIPGAP" predict --gap "6 ${angstrom}" --bias 0.1V --mc-samples 0 --format csv
sed "s/^temperature: .*/temperature: 77 ${kelvin}/" "$TIPGAP_SOURCE_DIR/configs/default.yaml" > kelvin.yaml
grep -q "$kelvin" kelvin.yaml || fail "8: the test config has no KELVIN SIGN"
expect 0 "" -- "$TIPGAP" predict --config kelvin.yaml --gap 0.6nm --bias 0.1V --mc-samples 0 --format csv
grep -q '^0.59.*,77,' out.txt || fail "8: the KELVIN SIGN temperature was not read as 77 K: $(tail -1 out.txt)"
expect 3 "U\+2103" -- "$TIPGAP" predict --config <(sed "s/^temperature: .*/temperature: 77 $(printf '\xe2\x84\x83')/" "$TIPGAP_SOURCE_DIR/configs/default.yaml") --gap 0.6nm --bias 0.1V

[ "$fails" = 0 ] || { echo "$fails failure(s)"; exit 1; }
echo "hostile values: all checks passed"
