#!/usr/bin/env bash
# Issue 11, class 9: long work shows one progress line on a terminal (stderr), nothing when stderr
# is not a terminal, and stops cleanly on Ctrl-C. The terminal is a pseudo-terminal made by python.
# Env: TIPGAP (executable), TIPGAP_PYTHON (python3 with the standard library).
set -uo pipefail
: "${TIPGAP:?}"
py="${TIPGAP_PYTHON:-/usr/bin/python3}"
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
cd "$tmp"
fails=0
fail() { echo "FAIL: $*" >&2; fails=$((fails + 1)); }
# A predict grid of 250 x 250 points: a few seconds (longer under the sanitizers); the line shows
# after 0.2 s here (TIPGAP_PROGRESS_DELAY_MS) so that a fast machine still shows it.
export TIPGAP_PROGRESS_DELAY_MS=200
long=("$TIPGAP" predict --gap 0.4nm..1nm --bias 0.1V..1V --points 250 --mc-samples 0 --threads 1 --format csv --output grid.csv)

# pty_run INTERRUPT -- command...: runs the command on a pseudo-terminal, prints what the terminal
# showed and "exit=<code>"; INTERRUPT=1 sends SIGINT (Ctrl-C) once a progress line has shown.
pty_run() {
  local after=$1
  shift 2
  "$py" - "$after" "$@" <<'PY'
import os, pty, signal, sys, time
interrupt = sys.argv[1] == "1"; argv = sys.argv[2:]
pid, fd = pty.fork()
if pid == 0:
    for s in (signal.SIGINT, signal.SIGTERM, signal.SIGHUP): signal.signal(s, signal.SIG_DFL)
    os.execv(argv[0], argv)
out = b""; sent = False
while True:
    if interrupt and not sent and b"%" in out:
        os.kill(pid, signal.SIGINT); sent = True
    try:
        import select
        r, _, _ = select.select([fd], [], [], 0.1)
        if r:
            chunk = os.read(fd, 4096)
            if not chunk: break
            out += chunk
    except OSError:
        break
_, status = os.waitpid(pid, 0)
code = os.waitstatus_to_exitcode(status)
sys.stdout.write(out.decode("utf-8", "replace") + "\nexit=%d\n" % (code if code >= 0 else 128 - code))
PY
}

pty_run 0 -- "${long[@]}" > shown.txt
grep -q "exit=0" shown.txt || fail "the run on a terminal failed: $(tail -c 300 shown.txt)"
grep -qE "tipgap predict: +[0-9]+% \([0-9]+ of 62500\)" shown.txt || fail "no progress line on a terminal: $(tail -c 300 shown.txt)"
# not a terminal: stderr holds no progress line
"${long[@]}" 2> err.txt || fail "the run without a terminal failed"
grep -q "%" err.txt && fail "a progress line without a terminal: $(head -c 200 err.txt)"
# Ctrl-C while the line shows: exit 130, the line ended, no output file and no temporary left
rm -f grid.csv
pty_run 1 -- "${long[@]}" > interrupted.txt
grep -q "exit=130" interrupted.txt || fail "Ctrl-C during progress: $(tail -c 300 interrupted.txt)"
grep -q "%" interrupted.txt || fail "no progress line before Ctrl-C"
[ -z "$(ls -A | grep -v '\.txt$')" ] || fail "Ctrl-C left: $(ls -A)"

[ "$fails" = 0 ] || { echo "$fails failure(s)"; exit 1; }
echo "progress line: all checks passed"
