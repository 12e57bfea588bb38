#!/usr/bin/env bash
# Issue 11, classes 1-3: output paths, checked writes, interrupts. Each check names its class.
# Steps that need root (a 64 kB tmpfs in a private mount namespace for ENOSPC) are skipped with a
# printed reason otherwise. Env: TIPGAP (executable), TIPGAP_SOURCE_DIR (the repository).
set -uo pipefail
: "${TIPGAP:?}" "${TIPGAP_SOURCE_DIR:?}"
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
cd "$tmp"
fails=0
fail() { echo "FAIL: $*" >&2; fails=$((fails + 1)); }
curve="$TIPGAP_SOURCE_DIR/demo_scans/01_w_au111_clean.csv"
predict=("$TIPGAP" predict --gap 0.5nm..0.8nm --bias 0.1V --points 4 --mc-samples 0)

# expect CODE PATTERN -- command...: exit code and a stderr line matching PATTERN.
expect() {
  local code=$1 pattern=$2
  shift 3
  "$@" > out.txt 2> err.txt
  local rc=$?
  [ "$rc" = "$code" ] || { fail "$*: exit $rc, expected $code; stderr: $(head -c 300 err.txt)"; return 1; }
  [ -z "$pattern" ] || grep -qE -- "$pattern" err.txt || { fail "$*: stderr lacks /$pattern/: $(head -c 300 err.txt)"; return 1; }
  return 0
}

# --- 1. Output paths
echo old > target.csv && ln -s target.csv link.csv
expect 0 "" -- "${predict[@]}" --format csv --output link.csv
[ -L link.csv ] || fail "1: the symbolic link was replaced by a file"
grep -q gap target.csv || fail "1: the link's target did not get the new content"
mkfifo fifo.csv
expect 3 "not a regular file" -- timeout 5 "${predict[@]}" --output fifo.csv
[ -p fifo.csv ] || fail "1: the FIFO was replaced"
mkdir adir
expect 3 "is a directory" -- "${predict[@]}" --output adir
for dev in /dev/null /dev/stdout; do
  # a refusal before any write: the device is never touched
  expect 3 "standard output" -- "${predict[@]}" --output "$dev"
done
[ -c /dev/null ] || fail "1: /dev/null is no longer a device"
cp "$curve" v.csv && ln -s v.csv vlink.csv && cp v.csv v.orig
expect 3 "also an input" -- "$TIPGAP" fit v.csv --output v.csv
expect 3 "also an input" -- "$TIPGAP" fit v.csv --output vlink.csv
cmp -s v.csv v.orig || fail "1: the input was changed"
expect 3 "two outputs" -- "$TIPGAP" synth --out s.csv --truth s.csv
[ ! -e s.csv ] || fail "1: synth --out F --truth F left F"
expect 3 "two outputs" -- "$TIPGAP" fit v.csv --plot r.png --output r.png
# all or nothing: the report cannot be written (its directory is missing), so no plot is left
expect 3 "" -- "$TIPGAP" fit v.csv --plot all.png --output missing-dir/report.txt
[ ! -e all.png ] || fail "1: a plot was left behind when the report failed"

# --- 2. Every write checked
if [ -w /dev/full ]; then
  "${predict[@]}" --output - > /dev/full 2> err.txt; rc=$?
  [ "$rc" = 3 ] || fail "2: writing to /dev/full ended with $rc, expected 3"
  grep -q "standard output.*No space" err.txt || fail "2: /dev/full: unclear message: $(cat err.txt)"
fi
"${predict[@]}" >&- 2> err.txt; rc=$?
[ "$rc" = 3 ] || fail "2: a closed stdout ended with $rc, expected 3 ($(cat err.txt))"
# a closed pipe ends quietly with 141 (128 + SIGPIPE)
"$TIPGAP" predict --gap 0.5nm..1nm --bias 0.1V --points 200000 --mc-samples 0 --format csv 2> err.txt | head -c 10 > /dev/null
rc=${PIPESTATUS[0]}
[ "$rc" = 141 ] || fail "2: a closed pipe ended with $rc, expected 141"
[ ! -s err.txt ] || fail "2: a closed pipe printed: $(head -c 200 err.txt)"
if [ "$(id -u)" = 0 ] && command -v unshare > /dev/null && unshare -m true 2> /dev/null; then
  cat > full.sh <<'INNER'
set -u
mkdir -p small && mount -t tmpfs -o size=64k tmpfs small || { echo "SKIP: mount failed"; exit 0; }
head -c 60000 /dev/zero > small/filler
"$@" --format csv --output small/report.csv 2> err.txt; echo "rc=$?"
cat err.txt
ls -a small
umount small
INNER
  unshare -m bash full.sh "$TIPGAP" predict --gap 0.3nm..1nm --bias 0.1V --points 2000 --mc-samples 0 > full.txt 2>&1
  if grep -q SKIP full.txt; then echo "SKIP: ENOSPC step: $(cat full.txt)"; else
    grep -q "rc=3" full.txt || fail "2: a full disk did not end with exit 3: $(cat full.txt)"
    grep -q "small/report.csv" full.txt || fail "2: the full-disk message does not name the user's path"
    grep -q "tmp-" full.txt && fail "2: a temporary was named or left: $(cat full.txt)"
    grep -qx "report.csv" full.txt && fail "2: a file was left at the destination"
  fi
else
  echo "SKIP: ENOSPC step needs root and unshare -m (a 64 kB tmpfs)"
fi

# --- 3. Interrupts: the run's temporaries are removed and the exit code is 128 + signal
# A background job of a non-interactive shell starts with SIGINT ignored (and an ignored signal
# stays ignored, as for nohup); python puts the default back before exec.
start_default_signals() { exec /usr/bin/python3 -c 'import os, signal, sys
for s in (signal.SIGINT, signal.SIGTERM, signal.SIGHUP): signal.signal(s, signal.SIG_DFL)
os.execv(sys.argv[1], sys.argv[1:])' "$@"; }
for sig in INT TERM HUP; do
  mkdir -p "sig-$sig"
  start_default_signals "$TIPGAP" synth --grid 400x400 --out "sig-$sig/g.csv" > /dev/null 2>&1 &
  pid=$!
  # wait until the run has a temporary (or has finished)
  for _ in $(seq 500); do [[ "$(ls -A "sig-$sig")" == *tmp* ]] && break; kill -0 $pid 2> /dev/null || break; sleep 0.01; done
  kill -s "$sig" $pid; wait $pid; rc=$?
  case $sig in INT) want=130 ;; TERM) want=143 ;; HUP) want=129 ;; esac
  [ "$rc" = "$want" ] || fail "3: SIG$sig ended with $rc, expected $want"
  [ -z "$(ls -A "sig-$sig")" ] || fail "3: SIG$sig left: $(ls -A "sig-$sig")"
done
# map: a directory temporary is removed too
# (large enough that the map runs for a few hundred ms after its temporary appears, so that the
# signal lands inside the run even on a loaded machine)
"$TIPGAP" synth --grid 128x128 --points-per-curve 128 --out grid.csv > /dev/null 2>&1 || fail "3: synth --grid failed"
mkdir mapdir
start_default_signals "$TIPGAP" map grid.csv --output-dir mapdir/out --threads 1 > /dev/null 2>&1 &
pid=$!
for _ in $(seq 500); do [[ "$(ls -A mapdir)" == *tmp* ]] && break; kill -0 $pid 2> /dev/null || break; sleep 0.01; done
kill -s INT $pid; wait $pid; rc=$?
[ "$rc" = 130 ] || fail "3: map: SIGINT ended with $rc, expected 130"
[ -z "$(ls -A mapdir)" ] || fail "3: map: SIGINT left: $(ls -A mapdir)"
# a stale temporary of a dead process is removed by the next run beside its output
mkdir stale && (exit 0) & dead=$!; wait $dead
echo partial > "stale/.r.csv.tmp-$dead-0"
echo mine > "stale/.r.csv.tmp-$$-0"
expect 0 "" -- "${predict[@]}" --format csv --output stale/r.csv
[ ! -e "stale/.r.csv.tmp-$dead-0" ] || fail "3: a stale temporary of a dead process was kept"
[ -e "stale/.r.csv.tmp-$$-0" ] || fail "3: a temporary of a live process was removed"

[ "$fails" = 0 ] || { echo "$fails failure(s)"; exit 1; }
echo "hostile outputs: all checks passed"
