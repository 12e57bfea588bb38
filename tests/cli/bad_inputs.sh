#!/usr/bin/env bash
# Runs every case of tests/bad_inputs/cases.tsv and checks that tipgap refuses the input cleanly:
#   - the exit code is the one in the manifest (2 usage, 3 input, 4 no answer; never 70 or a signal),
#   - stderr is exactly one line "tipgap: <kind>: ...", at most 400 bytes, containing the expected
#     fragment, with no exception type names, abort texts or sanitizer reports,
#   - nothing at all is written to stdout (no half table), and no file or directory appears in the
#     scratch directory the outputs point into (no partial --output or --output-dir).
# Manifest columns (tab separated; '#' lines and blank lines are skipped):
#   file      path under tests/bad_inputs/, or @name for a file this script generates, or - for none
#   command   arguments after `tipgap` ("(none)" for none); {file} is replaced by the file's path, {tmp}
#             by a scratch dir
#   exit      expected exit code
#   fragment  text that must appear in the stderr line ({file} and {tmp} are replaced too)
# Env: TIPGAP (executable), TIPGAP_SOURCE_DIR. TIPGAP_LONG_LINE_BYTES sets the length of the
# generated very long lines (default 1 GiB; the sanitizer build uses less to keep CI time down).
set -euo pipefail
: "${TIPGAP:?}" "${TIPGAP_SOURCE_DIR:?}"
corpus="$TIPGAP_SOURCE_DIR/tests/bad_inputs"
manifest="$corpus/cases.tsv"
long_bytes="${TIPGAP_LONG_LINE_BYTES:-1073741824}"
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT

# Generated inputs: too big (or too pathological) to keep in git.
gen="$tmp/gen"
mkdir -p "$gen"
header='z [nm],current [nA]'
{ echo "$header"; echo "0.00,1.00"; head -c "$long_bytes" /dev/zero | tr '\0' '7'; echo ",0.5"; echo "0.02,0.67"; } \
  > "$gen/long_number_line.csv"
{ echo "$header"; echo "0.00,1.00"; echo -n "0.01,"; head -c "$long_bytes" /dev/zero | tr '\0' 'x'; echo; } \
  > "$gen/long_text_line.csv"
{ head -c "$long_bytes" /dev/zero | tr '\0' 'z'; echo " [nm],current [nA]"; } > "$gen/long_header.csv"
{ printf 'tip: {material: tungsten}\nsample: {material: gold}\ntemperature: '
  head -c 5000 /dev/zero | tr '\0' '1'; echo " eV"; } > "$gen/long_value.yaml"
{ printf 'tip: {material: tungsten}\nsample: {material: gold}\ndescription: '
  head -c $((8 * 1024 * 1024)) /dev/zero | tr '\0' 'd'; echo; } > "$gen/oversized.yaml"
{ printf 'tip: '; head -c 100000 /dev/zero | tr '\0' '['; echo; } > "$gen/deep_nesting.yaml"
mkdir -p "$gen/a_directory.yaml" "$gen/a_directory.csv"

: > "$tmp/out"
: > "$tmp/err"
pass=0
failures=0
fail() {
  echo "FAIL [$1]: $2" >&2
  failures=$((failures + 1))
}

while IFS=$'\t' read -r file command expected_exit fragment || [ -n "$file" ]; do
  [ -z "$file" ] && continue
  case "$file" in \#*) continue ;; esac
  case "$file" in
    -) path="" ;;
    @*) path="$gen/${file#@}" ;;
    *) path="$corpus/$file" ;;
  esac
  if [ -n "$path" ] && [ ! -e "$path" ]; then
    fail "$file" "corpus file missing: $path"
    continue
  fi
  [ "$command" = "(none)" ] && command=""
  cmd=${command//\{file\}/$path}
  cmd=${cmd//\{tmp\}/$tmp}
  want=${fragment//\{file\}/$path}
  want=${want//\{tmp\}/$tmp}
  # Word splitting of the command column: arguments hold no spaces except inside '...'.
  eval "args=($cmd)"
  before=$(ls -A "$tmp")
  set +e
  "$TIPGAP" "${args[@]}" > "$tmp/out" 2> "$tmp/err"
  code=$?
  set -e
  label="$file: $command"
  err=$(cat "$tmp/err")
  lines=$(wc -l < "$tmp/err")
  bytes=$(wc -c < "$tmp/err")
  [ "$code" = "$expected_exit" ] || { fail "$label" "exit $code, expected $expected_exit; stderr: ${err:0:500}"; continue; }
  [ "$lines" = 1 ] || { fail "$label" "stderr has $lines lines, expected 1: ${err:0:500}"; continue; }
  [ "$bytes" -le 400 ] || { fail "$label" "stderr line is $bytes bytes (echoed input not clipped?)"; continue; }
  [[ "$err" =~ ^tipgap:\ (error|usage\ error|no\ answer):\  ]] || { fail "$label" "not a tipgap message: $err"; continue; }
  [[ "$err" == *"$want"* ]] || { fail "$label" "stderr lacks '$want': $err"; continue; }
  for bad in "terminate called" "what():" "std::" "YAML::" "CLI::" "Exception" "Sanitizer" "runtime error:" \
             "internal error" "Assertion"; do
    [[ "$err" != *"$bad"* ]] || { fail "$label" "stderr shows '$bad': $err"; continue 2; }
  done
  [ ! -s "$tmp/out" ] || { fail "$label" "wrote $(wc -c < "$tmp/out") bytes to stdout"; continue; }
  # A refused run writes nothing: no --output file, no --output-dir, no temporary left behind.
  after=$(ls -A "$tmp")
  [ "$before" = "$after" ] || { fail "$label" "left files behind in the scratch dir: $(comm -13 <(echo "$before") <(echo "$after") | tr '\n' ' ')"; continue; }
  pass=$((pass + 1))
done < "$manifest"

echo "bad inputs: $pass passed, $failures failed"
[ "$pass" -ge 1 ] || { echo "FAIL: no cases ran" >&2; exit 1; }
[ "$failures" = 0 ]
