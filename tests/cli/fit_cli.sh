#!/usr/bin/env bash
# CLI test of `tipgap fit`: runs it on curve files written here and checks the numbers, the three
# output formats, --output and the error messages / exit codes.
# Env: TIPGAP (executable), TIPGAP_PYTHON (Debian python3 with numpy).
set -euo pipefail
: "${TIPGAP:?}" "${TIPGAP_PYTHON:?}"
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
fail() { echo "FAIL: $*" >&2; exit 1; }

# A noise-free exponential, kappa = 10/nm, written with 17 digits; then an approach/retract pair
# with a direction column (kappa 10/nm approaching, 9/nm retracting).
"$TIPGAP_PYTHON" - "$tmp" <<'EOF'
import math, sys
d = sys.argv[1]
with open(f"{d}/clean.csv", "w") as f:
    f.write("# synthetic, noise-free\n# bias: 100 mV\n# sample: Au(111)\nz [Å],current [nA]\n")
    for k in range(41):
        z = 0.05 * k  # Å
        f.write(f"{z!r},{2.0 * math.exp(-2.0 * 1.0 * z)!r}\n")  # kappa = 1/Å = 10/nm
with open(f"{d}/pair.csv", "w") as f:
    f.write("z [nm],current [pA],direction\n")
    for k in range(31):
        z = 0.3 - 0.01 * k
        f.write(f"{z!r},{1000 * math.exp(-20.0 * z)!r},approach\n")
    for k in range(31):
        z = 0.01 * k
        f.write(f"{z!r},{1000 * math.exp(-18.0 * z)!r},retract\n")
EOF

# JSON: numbers against the closed forms, kappa = 10/nm exactly, phi = hbar^2 kappa^2 / 2m with
# CODATA 2018 constants, nm per decade = ln 10 / (2 kappa). Noise-free data: agreement to 1e-9.
"$TIPGAP" fit "$tmp/clean.csv" "$tmp/pair.csv" --format json > "$tmp/out.json"
"$TIPGAP_PYTHON" - "$tmp/out.json" "$tmp" <<'EOF'
import json, math, sys
doc = json.load(open(sys.argv[1]))
c = doc["curves"]
assert len(c) == 3, len(c)
hbar = 6.62607015e-34 / (2 * math.pi); me = 9.1093837015e-31; e = 1.602176634e-19  # CODATA 2018
def near(a, b, rtol, what):
    assert abs(a - b) <= rtol * abs(b), f"{what}: {a!r} vs {b!r}"
RTOL = 1e-9  # exact data: only rounding of the logarithms and the SVD
r = c[0]
assert r["file"] == sys.argv[2] + "/clean.csv", r["file"]
assert r["direction"] == "retract" and r["model"] == "offset" and r["status"] == "converged"
near(r["decay_constant_per_nm"], 10.0, RTOL, "kappa")
near(r["apparent_barrier_eV"], hbar**2 * (10e9)**2 / (2 * me) / e, RTOL, "phi_ap")
near(r["nm_per_decade"], math.log(10) / 20.0, RTOL, "nm per decade")
# Noise-free: the noise model keeps sigma_I at 1e-9 of the largest current (fit_internal.hpp), so the
# error is of that relative size (1.5e-8 /nm here), far below any measured one.
assert r["decay_constant_stderr_per_nm"] < 1e-7, r["decay_constant_stderr_per_nm"]
assert abs(r["offset_A"]) < 1e-17 and "offset_stderr_A" in r and "reduced_chi_square" in r, r["offset_A"]
assert r["points_used"] == 41 and r["points_total"] == 41, (r["points_used"], r["points_total"])
near(r["prefactor_A"], 2e-9, RTOL, "prefactor")
assert r["metadata"]["sample"] == "Au(111)"
for key in ["decay_constant_ci_low_per_nm", "apparent_barrier_stderr_eV", "r_squared", "warnings", "profile", "contact"]:
    assert key in r, key
assert [x["direction"] for x in c[1:]] == ["approach", "retract"]
near(c[1]["decay_constant_per_nm"], 10.0, RTOL, "approach kappa")
near(c[2]["decay_constant_per_nm"], 9.0, RTOL, "retract kappa")
# Several sweeps: the summary (fit_summary.hpp). Weighted mean of kappa with w = 1/se^2, approach
# minus retract over the sweeps of each direction (here 10 - mean of the two retracts).
s = doc["summary"]
assert s["sweeps"] == 3 and s["approach_sweeps"] == 1 and s["retract_sweeps"] == 2, s
w = [1 / x["decay_constant_stderr_per_nm"] ** 2 for x in c]
mean = sum(wi * x["decay_constant_per_nm"] for wi, x in zip(w, c)) / sum(w)
near(s["decay_constant_mean_per_nm"], mean, 1e-12, "weighted mean")
wr = [w[0], w[2]]
retract = (wr[0] * c[0]["decay_constant_per_nm"] + wr[1] * c[2]["decay_constant_per_nm"]) / sum(wr)
near(s["approach_minus_retract_per_nm"], c[1]["decay_constant_per_nm"] - retract, 1e-9, "approach - retract")
# The two retract sweeps (10 and 9 /nm, exact) disagree far beyond their errors: the Birge ratio
# scales the retract mean's error up to their scatter, and the difference is then not significant.
assert s["decay_constant_birge_ratio"] > 1e6, s
zscore = abs(s["approach_minus_retract_per_nm"]) / s["approach_minus_retract_stderr_per_nm"]
near(s["approach_minus_retract_p_value"], math.erfc(zscore / math.sqrt(2)), 1e-9, "p value")  # 2(1 - Phi(z))
assert s["approach_minus_retract_p_value"] > 0.05, s
EOF

# CSV: the header, and the same numbers as the JSON to the last digit (17 significant digits).
"$TIPGAP" fit "$tmp/clean.csv" --format csv > "$tmp/out.csv"
head -1 "$tmp/out.csv" | grep -q '^file,direction,model,status,decay_constant_per_nm,decay_constant_stderr_per_nm,' \
  || fail "CSV header: $(head -1 "$tmp/out.csv")"
"$TIPGAP_PYTHON" - "$tmp/out.csv" "$tmp/out.json" <<'EOF'
import csv, json, sys
row = next(csv.DictReader(open(sys.argv[1])))
ref = json.load(open(sys.argv[2]))["curves"][0]
for key in ["decay_constant_per_nm", "apparent_barrier_eV", "nm_per_decade", "r_squared"]:
    assert float(row[key]) == ref[key], (key, row[key], ref[key])
assert row["points_used"] == "41"
EOF

# Table: rounded, units in the header.
"$TIPGAP" fit "$tmp/clean.csv" > "$tmp/out.txt"
head -1 "$tmp/out.txt" | grep -q 'kappa \[1/nm\].*phi_ap \[eV\].*nm/decade' || fail "table header: $(head -1 "$tmp/out.txt")"
grep -Eq 'clean.csv  retract   offset  +10\.0000+ ± 0\.0+[1-9][0-9]?  ' "$tmp/out.txt" || fail "table row: $(sed -n 2p "$tmp/out.txt")"

# --output: nothing on stdout, the file written whole.
out=$("$TIPGAP" fit "$tmp/clean.csv" --format json --output "$tmp/written.json")
[ -z "$out" ] || fail "--output also printed to stdout"
cmp -s "$tmp/written.json" <("$TIPGAP" fit "$tmp/clean.csv" --format json) || fail "--output differs from stdout"

# Errors: a bad cell is an input error (exit 3) naming file:line:column; a flag without a unit is a
# usage error (exit 2).
printf 'z [nm],current [nA]\n0,1\n0.1,abc\n0.2,0.2\n' > "$tmp/bad.csv"
set +e
msg=$("$TIPGAP" fit "$tmp/bad.csv" 2>&1 >/dev/null); code=$?
set -e
[ "$code" -eq 3 ] || fail "bad cell: exit $code"
[ "$msg" = "tipgap: error: $tmp/bad.csv:3:5: 'abc' in column 'current' is not a number; expected a plain number such as 0.25 (the unit goes in the header)" ] || fail "bad cell: $msg"
set +e
msg=$("$TIPGAP" fit "$tmp/clean.csv" --noise-floor 2 2>&1 >/dev/null); code=$?
set -e
[ "$code" -eq 2 ] || fail "flag without unit: exit $code"
[ "$msg" = "tipgap: usage error: --noise-floor: '2' has no unit; expected a current in A, mA, uA, nA, pA, fA" ] \
  || fail "flag without unit: $msg"
set +e
msg=$("$TIPGAP" fit "$tmp/clean.csv" --calibration-uncertainty 0.7 2>&1 >/dev/null); code=$?
set -e
[ "$code" -eq 2 ] || fail "calibration: exit $code"
[ "$msg" = "tipgap: usage error: --calibration-uncertainty: 0.7 is out of range; expected a relative uncertainty in [0, 0.5), e.g. 0.02" ] \
  || fail "calibration: $msg"
echo "fit CLI: all checks passed"
