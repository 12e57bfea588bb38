#!/usr/bin/env bash
# tipgap resonances (issue 12 "Done when"): on synthetic z(V) traces from an independent generator
# (tests/crosscheck/zv_trace_check.py: SciPy solve_ivp physics, not tipgap's synth), the sample work
# function is recovered within 0.1 eV and the first peaks within 0.1 V of the truth. Also the JSON
# contract, CSV and table output, the demo trace, and error messages / exit codes.
set -euo pipefail
T="${TIPGAP:?}"; PY="${TIPGAP_PYTHON:-/usr/bin/python3}"; SRC="${TIPGAP_SOURCE_DIR:?}"
tmp=$(mktemp -d); trap 'rm -rf "$tmp"' EXIT
fail() { echo "FAIL: $*"; exit 1; }
data="$SRC/tests/data"

for f in a_clean a_noisy1 a_noisy2 b_clean b_noisy1; do
  "$T" resonances "$data/zv_trace_$f.csv" --format json --threads 2 > "$tmp/$f.json" || fail "resonances $f"
done
"$PY" - "$tmp" "$data" <<'PYEOF'
import json, os, sys
tmp, data = sys.argv[1], sys.argv[2]
# Issue 12, "Done when": 0.1 eV and 0.1 V.
WF_TOL_EV, PEAK_TOL_V = 0.1, 0.1
for f in ("a_clean", "a_noisy1", "a_noisy2", "b_clean", "b_noisy1"):
    r = json.load(open(os.path.join(tmp, f + ".json")))
    truth = json.load(open(os.path.join(data, "zv_trace_%s.truth.json" % f[0])))
    for k in ("peaks", "work_function_eV", "work_function_stderr_eV", "work_function_formula_eV", "status"):
        assert k in r, k
    assert r["status"] == "ok", (f, r["status"], r["message"])
    wf = truth["sample_work_function_eV"]
    err = abs(r["work_function_eV"] - wf)
    lo, hi = r["work_function_ci_eV"]
    print(f"{f}: W = {r['work_function_eV']:.3f} ± {r['work_function_stderr_eV']:.3f} eV "
          f"(truth {wf}, error {err:.3f}, 95 % [{lo:.3f}, {hi:.3f}]); formula {r['work_function_formula_eV']:.3f} eV")
    assert err <= WF_TOL_EV, (f, err)
    peaks = r["peaks"]
    assert len(peaks) >= 2, (f, peaks)
    for p, t in zip(peaks, truth["peaks_V"]):
        assert set(p) >= {"order", "bias_V", "bias_stderr_V"}, p
        print(f"   n = {p['order']}: {p['bias_V']:.3f} ± {p['bias_stderr_V']:.3f} V (truth {t:.3f}, error {p['bias_V'] - t:+.3f})")
        assert abs(p["bias_V"] - t) <= PEAK_TOL_V, (f, p, t)
print("recovery ok")
PYEOF

# CSV and table carry the same peaks; the demo trace (tipgap's own synth) is recovered too.
"$T" resonances "$data/zv_trace_a_clean.csv" --format csv --formula-only > "$tmp/a.csv"
grep -q '^order,bias_V,bias_stderr_V,modulation,model_bias_V$' "$tmp/a.csv" || fail "csv header"
[ "$(grep -c '^[123],' "$tmp/a.csv")" = 3 ] || fail "csv rows"
"$T" resonances "$SRC/demo_scans/resonances/08_w_ag_island_zv.csv" --threads 2 --plot "$tmp/r.png" > "$tmp/t.txt"
grep -q '^work function (exact-model fit): 4\.[56]' "$tmp/t.txt" || { cat "$tmp/t.txt"; fail "demo trace"; }
[ -s "$tmp/r.png" ] || fail "plot"

# Errors: a trace without '# current:' needs --formula-only; a bad smoothing width is a usage error.
grep -v '^# current' "$data/zv_trace_a_clean.csv" > "$tmp/nocurrent.csv"
set +e
msg=$("$T" resonances "$tmp/nocurrent.csv" 2>&1); rc=$?
set -e
[ "$rc" = 3 ] || fail "exit $rc without current"
[ "$msg" = "tipgap: error: $tmp/nocurrent.csv: current: the trace has no '# current:' line; the model fit needs the setpoint current (e.g. '# current: 1 nA')" ] || fail "message: $msg"
"$T" resonances "$tmp/nocurrent.csv" --formula-only > /dev/null || fail "--formula-only without current"
set +e
msg=$("$T" resonances "$data/zv_trace_a_clean.csv" --smoothing 5V 2>&1); rc=$?
set -e
[ "$rc" = 2 ] || fail "exit $rc for --smoothing 5V"
echo "$msg" | grep -q -- "--smoothing" || fail "message: $msg"
echo "resonances cli ok"
