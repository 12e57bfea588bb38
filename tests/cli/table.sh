#!/usr/bin/env bash
# tipgap table: the teaching table's numbers against their textbook formulas, and bad sample names.
set -u
PY=${TIPGAP_PYTHON:-/usr/bin/python3}
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
fail() { echo "FAIL: $*" >&2; exit 1; }

"$TIPGAP" table --samples gold,graphite --format json > "$work/t.json" || fail "table exited $?"
"$PY" - "$work/t.json" <<'PYEOF' || fail "table JSON"
import json, math, sys
d = json.load(open(sys.argv[1]))
assert d["reference_setpoint"] == {"current_A": 1e-9, "bias_V": 0.1}, d["reference_setpoint"]
rows = d["rows"]
assert [r["sample"] for r in rows] == ["gold", "graphite"], rows
# CODATA 2018: m_e = 9.1093837015e-31 kg, hbar = 1.054571817e-34 J s, h = 6.62607015e-34 J s,
# e = 1.602176634e-19 C. Tip: the built-in tungsten, 4.55 eV; gold 5.31 eV, graphite 4.6 eV (library).
m, hbar, h, e = 9.1093837015e-31, 1.054571817e-34, 6.62607015e-34, 1.602176634e-19
for r, phi_s in zip(rows, (5.31, 4.6)):
    phi = 0.5 * (4.55 + phi_s)
    assert abs(r["mean_barrier_eV"] - phi) < 1e-12, r
    kappa = math.sqrt(2 * m * phi * e) / hbar * 1e-9
    assert abs(r["decay_constant_per_nm"] / kappa - 1) < 1e-9, (r, kappa)
    assert abs(r["nm_per_decade"] / (math.log(10) / (2 * kappa)) - 1) < 1e-9, r
    lam = h / math.sqrt(2 * m * phi * e) * 1e9
    assert abs(r["de_broglie_wavelength_nm"] / lam - 1) < 1e-9, r
    assert 0.5 < r["gap_nm"] < 1.0 and 3.0 < r["apparent_barrier_eV"] < phi, r
PYEOF
"$TIPGAP" table --samples gold > "$work/t.txt" || fail "table text"
head -1 "$work/t.txt" | grep -q "reference setpoint 1e-09 A at 0.1 V" || fail "table header names the setpoint"
"$TIPGAP" table --samples gold,unobtainium > /dev/null 2> "$work/bad.err"
rc=$?
[ $rc -eq 3 ] || fail "unknown material: exit $rc, expected 3"
grep -q "^tipgap: error: --samples: unknown material 'unobtainium'; expected one of the materials library: tungsten (W)," "$work/bad.err" || fail "unknown material message"
echo "table CLI: ok"
