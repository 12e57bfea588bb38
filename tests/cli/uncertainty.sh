#!/usr/bin/env bash
# Uncertainty through the CLI: plan and predict with "value ± sigma" inputs, seeded Monte Carlo
# reproducibility, and agreement with linear propagation for small sigmas.
set -u
PY=${TIPGAP_PYTHON:-/usr/bin/python3}
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
fail() { echo "FAIL: $*" >&2; exit 1; }

cat > "$work/small.yaml" <<'YAML'
tip: { material: tungsten, work_function: 4.5 ± 0.01 eV }
sample: { material: gold, work_function: 5.3 +- 0.01 eV }
YAML
"$TIPGAP" plan -c "$work/small.yaml" --current 1nA --bias 0.1V --mc-samples 1000 --seed 5 --format json > "$work/a.json" || fail "plan exited $?"
"$TIPGAP" plan -c "$work/small.yaml" --current 1nA --bias 0.1V --mc-samples 1000 --seed 5 --threads 1 --format json > "$work/b.json" || fail "plan exited $?"
cmp -s "$work/a.json" "$work/b.json" || fail "same seed, different output"
"$PY" - "$work/a.json" <<'PYEOF' || fail "uncertainty JSON"
import json, math, sys
d = json.load(open(sys.argv[1]))
p = d["points"][0]
assert d["uncertainty"]["monte_carlo_samples"] == 1000 and d["uncertainty"]["seed"] == 5, d["uncertainty"]
assert d["uncertainty"]["inputs"] == ["tip.work_function", "sample.work_function"], d["uncertainty"]
lo, hi = p["gap_nm_ci95"]
assert lo < p["gap_nm"] < hi, p
# MC and linear agree for 0.01 eV: the sample stddev of 1000 draws has a relative standard error of
# 1/sqrt(2*999) = 2.2 %; allow 4 of them.
r = p["gap_nm_stddev"] / p["gap_nm_linear_stddev"]
assert abs(r - 1) < 4 / math.sqrt(2 * 999), r
lin_lo, lin_hi = p["gap_nm_linear_ci95"]
assert abs((lin_hi - lin_lo) / (2 * 1.959963984540054 * p["gap_nm_linear_stddev"]) - 1) < 1e-12
PYEOF

# A different seed gives different draws.
"$TIPGAP" plan -c "$work/small.yaml" --current 1nA --bias 0.1V --mc-samples 1000 --seed 6 --format json > "$work/c.json" || fail "plan exited $?"
cmp -s "$work/a.json" "$work/c.json" && fail "different seeds, same output"

# predict with uncertainty: current_A_stddev and its interval.
"$TIPGAP" predict -c "$work/small.yaml" --gap 0.7nm --bias 0.1V --mc-samples 500 --format json > "$work/p.json" || fail "predict exited $?"
"$PY" -c "
import json, math
p = json.load(open('$work/p.json'))['points'][0]
lo, hi = p['current_A_ci95']
assert lo < p['current_A'] < hi, p
r = p['current_A_stddev'] / p['current_A_linear_stddev']
assert abs(r - 1) < 4 / math.sqrt(2 * 499), r
" || fail "predict uncertainty"

# --mc-samples 0: linear propagation only, no Monte Carlo keys.
"$TIPGAP" plan -c "$work/small.yaml" --current 1nA --bias 0.1V --mc-samples 0 --format json > "$work/l.json" || fail "linear only"
"$PY" -c "
import json
p = json.load(open('$work/l.json'))['points'][0]
assert 'gap_nm_stddev' not in p and p['gap_nm_linear_stddev'] > 0, p
" || fail "linear only keys"
echo "uncertainty CLI: ok"
