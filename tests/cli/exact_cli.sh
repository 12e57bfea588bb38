#!/usr/bin/env bash
# `method: exact` from the command line: the YAML key, predict's d ln|I|/dV, a plan in the resonance
# regime, and the error message naming the three methods.
set -euo pipefail
T="${TIPGAP:?}"; PY="${TIPGAP_PYTHON:-/usr/bin/python3}"
tmp=$(mktemp -d); trap 'rm -rf "$tmp"' EXIT
fail() { echo "FAIL: $*"; exit 1; }

for m in wkb exact; do
  cat > "$tmp/$m.yaml" <<YAML
tip:    { material: tungsten, work_function: 4.5 eV, fermi_energy: 9.0 eV }
sample: { material: gold, work_function: 5.3 eV, fermi_energy: 5.5 eV }
barrier: { image_potential: exact, relative_permittivity: 1 }
temperature: 4.2 K
method: $m
bias_limit: 12 V
geometry: { kind: planar, area: 1 nm^2 }
YAML
  "$T" predict --config "$tmp/$m.yaml" --gap 0.8nm --bias 0.1V,0V --format json > "$tmp/p_$m.json"
done
"$PY" - "$tmp/p_exact.json" "$tmp/p_wkb.json" <<'PYEOF'
import json, sys
e = json.load(open(sys.argv[1])); w = json.load(open(sys.argv[2]))
assert e["config"]["method"] == "exact", e["config"].get("method")
pe, pw = e["points"][0], w["points"][0]
# README "Exact transmission": J_exact/J_wkb = 1.59 at 0.8 nm, 0.1 V (quoted to 2 decimals).
r = pe["current_density_A_per_m2"] / pw["current_density_A_per_m2"]
assert abs(r - 1.59) <= 0.005, r
# d ln|I|/dV at 0.1 V is dominated by the 1/V of the ohmic regime: 1/V = 10 per V, plus a little.
assert 10.0 < pe["dlnI_dV_per_V"] < 10.5, pe["dlnI_dV_per_V"]
assert e["points"][1]["dlnI_dV_per_V"] is None, "null at zero bias"
print("predict exact ok")
PYEOF

"$T" plan --config "$tmp/exact.yaml" --current 1nA --bias 6.3V --format json > "$tmp/plan.json"
"$PY" - "$tmp/plan.json" <<'PYEOF'
import json, sys
p = json.load(open(sys.argv[1]))["points"][0]
assert p["status"] == "converged", p["status"]
assert 1.0 < p["gap_nm"] < 2.5, p["gap_nm"]
print("plan exact ok")
PYEOF

printf 'tip: {work_function: 4.5 eV}\nsample: {work_function: 5.3 eV}\nmethod: airy\n' > "$tmp/bad.yaml"
set +e
msg=$("$T" predict --config "$tmp/bad.yaml" --gap 1nm --bias 0.1V 2>&1); rc=$?
set -e
[ "$rc" = 3 ] || fail "exit code $rc for an unknown method"
[ "$msg" = "tipgap: error: $tmp/bad.yaml:3:9: method: 'airy' is not a method; expected wkb, simmons or exact" ] || fail "message: $msg"
echo "exact cli ok"
