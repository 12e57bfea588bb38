#!/usr/bin/env bash
# CLI test of `tipgap synth`, `tipgap fit --plot/--config` and `tipgap demo`: byte-identical
# regeneration of demo_scans/, the numbers in the demo's JSON against the truth files and against
# `tipgap predict`, valid PNG files, and the synth error messages / exit codes.
# Env: TIPGAP (executable), TIPGAP_SOURCE_DIR, TIPGAP_PYTHON (Debian python3).
set -euo pipefail
: "${TIPGAP:?}" "${TIPGAP_SOURCE_DIR:?}" "${TIPGAP_PYTHON:?}"
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
fail() { echo "FAIL: $*" >&2; exit 1; }
scans="$TIPGAP_SOURCE_DIR/demo_scans"

# 1. demo_scans/ regenerates byte-identically (the script writes beside itself, so run a copy).
mkdir "$tmp/regen"
cp "$scans/make_demo_scans.sh" "$tmp/regen/"
bash "$tmp/regen/make_demo_scans.sh" "$TIPGAP"
for f in "$scans"/*.csv "$scans"/*.tsv "$scans"/*.truth.yaml "$scans"/*.read.yaml "$scans"/*.fit.yaml; do
  cmp -s "$f" "$tmp/regen/$(basename "$f")" || fail "$(basename "$f") does not regenerate byte-identically"
done
for f in "$scans"/resonances/*; do
  cmp -s "$f" "$tmp/regen/resonances/$(basename "$f")" || fail "resonances/$(basename "$f") does not regenerate byte-identically"
done
n=$(ls "$tmp/regen"/*.csv "$tmp/regen"/*.tsv | wc -l)
[ "$n" -eq "$(ls "$scans"/*.csv "$scans"/*.tsv | wc -l)" ] || fail "regenerated $n curves"

# 2. The demo runs and writes its files.
"$TIPGAP" demo --out "$tmp/demo" > "$tmp/demo.txt"
for f in prediction.csv fits.csv demo.json prediction.png fit-01_w_au111_clean.png fit-05_w_au111_pair-approach.png \
         fit-05_w_au111_pair-retract.png; do
  [ -s "$tmp/demo/$f" ] || fail "demo did not write $f"
done
grep -q "kappa inside its 95% interval for 10 of 10 sweeps" "$tmp/demo.txt" || { cat "$tmp/demo.txt"; fail "summary line"; }
# The file in another layout: the options it was read with, shown as `tipgap fit` takes them.
grep -qx "note: 08_w_au111_export.tsv is in another layout, read as: tipgap fit 08_w_au111_export.tsv --columns Z,I --flip-z --bias 0.1V --temperature 4.2K" "$tmp/demo.txt" \
  || { cat "$tmp/demo.txt"; fail "read options line"; }
grep -qx "offset inside its 95% interval for 1 of 1 offset-model fits." "$tmp/demo.txt" || fail "offset summary line"
grep -qx "note: 09_w_au111_offset.csv has an amplifier offset, fitted as: tipgap fit 09_w_au111_offset.csv (the default offset model)" "$tmp/demo.txt" \
  || fail "offset fit line"
grep -q "^plan at 0.1 V (setpoint ladder):" "$tmp/demo.txt" || fail "no plan line"
# The planned ladder: one decade of current per step, and the gap steps equal nm_per_decade
# (within 5 %: the local slope varies along a 0.1 nm step); about 0.1 nm per decade (common practice).
"$TIPGAP_PYTHON" - "$tmp/demo/demo.json" <<'PY'
import json, sys
plan = json.load(open(sys.argv[1]))["plan"]
assert [p["current_A"] for p in plan] == [1e-11, 1e-10, 1e-09, 1e-08], plan
gaps = [p["gap_nm"] for p in plan]
for a, b, p in zip(gaps, gaps[1:], plan):
    assert a > b, gaps
    assert abs((a - b) / p["nm_per_decade"] - 1) < 0.05, (a - b, p["nm_per_decade"])
    assert 0.08 < p["nm_per_decade"] < 0.13, p
print("plan ok")
PY

# 3. Real numbers in the JSON: every fitted kappa against its truth file (inside the stated 95 %
#    interval, which is t * stderr wide), phi_ap = hbar^2 kappa^2 / 2m (CODATA 2018), and the
#    prediction against `tipgap predict` at the same point (same code path: 1e-12 relative).
"$TIPGAP" predict --gap 0.9nm --bias 0.1V --format json > "$tmp/predict.json"
"$TIPGAP_PYTHON" - "$tmp/demo/demo.json" "$tmp/predict.json" "$scans" <<'PY'
import json, math, sys, re, os
doc = json.load(open(sys.argv[1])); pred = json.load(open(sys.argv[2])); scans = sys.argv[3]
hbar = 6.62607015e-34 / (2 * math.pi); me = 9.1093837015e-31; e = 1.602176634e-19  # CODATA 2018
assert doc["command"] == "demo" and doc["synthetic_data"] is True
curves = doc["curves"]
assert len(curves) == 10, len(curves)
def truth_values(path, key):
    # The expected (linear model) or the model's own (offset model: without the baseline) kappa
    # of each sweep, read with a regex (no YAML module in Debian's python3 by default).
    text = open(path).read()
    return [float(x) for x in re.findall(key + r": ([-0-9.e+]+)", text)]
seen = {}
for c in curves:
    stem = os.path.splitext(os.path.basename(c["file"]))[0]
    k = seen.get(stem, 0); seen[stem] = k + 1
    key = "decay_constant_expected_per_nm" if c["model"] == "linear" else "decay_constant_model_per_nm"
    assert (c["model"] == "offset") == os.path.exists(os.path.join(scans, stem + ".fit.yaml")), stem
    truth = truth_values(os.path.join(scans, stem + ".truth.yaml"), key)[k]
    assert abs(c["truth"][key] - truth) < 1e-12 * truth, (stem, truth)
    lo, hi = c["decay_constant_ci_low_per_nm"], c["decay_constant_ci_high_per_nm"]
    assert lo <= truth <= hi, (stem, lo, truth, hi)
    assert c["kappa_within_ci"] is True
    kap = c["decay_constant_per_nm"]
    assert 9.0 < kap < 12.0, kap
    phi = hbar**2 * (kap * 1e9)**2 / (2 * me) / e
    assert abs(c["apparent_barrier_eV"] - phi) < 1e-9 * phi, (c["apparent_barrier_eV"], phi)
    if c["model"] == "offset":
        # The offset of 09 (3 pA) inside t * stderr, the stderr well below the 1 pA noise.
        assert c["truth_offset_pA"] == 3.0 and c["offset_within_ci"] is True, c
        assert abs(c["offset_pA"] - 3.0) <= 2.0 * c["offset_stderr_pA"] < 0.6, c
        assert "model_fit" not in c, c  # the model comparison fits no offset
        continue
    m = c["model_fit"]
    # The image potential puts phi_ap below the fitted mean work function.
    assert m["mean_work_function_eV"] > c["apparent_barrier_eV"] + 0.2, (stem, m)
assert [c["contact"] for c in curves if "contact" in c["file"]] == ["plateau"]
assert [c["saturation_detected"] for c in curves if "saturated" in c["file"]] == [True]
assert doc["summary"] == {"curves_compared": 10, "kappa_within_ci": 10, "offsets_compared": 1, "offset_within_ci": 1}, doc["summary"]
export = [c for c in curves if c["file"].endswith("08_w_au111_export.tsv")]
assert [c["read_options"] for c in export] == [{"columns": "Z,I", "flip_z": "true", "bias_V": "0.1V", "temperature_K": "4.2K"}], export
assert all(c["read_options"] == {} for c in curves if c not in export)
p = [x for x in doc["prediction"] if abs(x["gap_nm"] - 0.9) < 1e-9]
assert len(p) == 1, [x["gap_nm"] for x in doc["prediction"]]
q = pred["points"][0]
for key in ["current_A", "decay_constant_per_nm", "apparent_barrier_eV"]:
    assert abs(p[0][key] - q[key]) <= 1e-12 * abs(q[key]), (key, p[0][key], q[key])
PY

# The export read by `tipgap fit` with the options the demo shows (and its --model linear) gives the
# demo's kappa.
"$TIPGAP" fit "$scans/08_w_au111_export.tsv" --model linear --columns Z,I --flip-z --bias 0.1V --temperature 4.2K --format json > "$tmp/export.json"
"$TIPGAP_PYTHON" - "$tmp/export.json" "$tmp/demo/demo.json" <<'PY'
import json, sys
fit = json.load(open(sys.argv[1]))["curves"][0]
demo = [c for c in json.load(open(sys.argv[2]))["curves"] if c["file"].endswith("08_w_au111_export.tsv")][0]
assert fit["decay_constant_per_nm"] == demo["decay_constant_per_nm"], (fit["decay_constant_per_nm"], demo["decay_constant_per_nm"])
PY

# 4. PNG files are PNG: signature and an IHDR of the documented size (800 px wide, three 420 px
#    panels plus the title band for fits).
"$TIPGAP" fit "$scans/01_w_au111_clean.csv" --plot "$tmp/one.png" --config default > "$tmp/fit.txt"
"$TIPGAP" fit "$scans/05_w_au111_pair.csv" --plot "$tmp/pair.png" > /dev/null
# Several sweeps: named after the input stem and the direction (issue 15).
[ -e "$tmp/pair-05_w_au111_pair-approach.png" ] && [ -e "$tmp/pair-05_w_au111_pair-retract.png" ] && [ ! -e "$tmp/pair.png" ] ||
    fail "pair plots not named after the input stem and direction"
"$TIPGAP_PYTHON" - "$tmp/one.png" "$tmp/pair-05_w_au111_pair-approach.png" "$tmp/demo/prediction.png" "$tmp/demo/fit-04_w_au111_contact.png" <<'PY'
import struct, sys, zlib
for path in sys.argv[1:]:
    d = open(path, "rb").read()
    assert d[:8] == b"\x89PNG\r\n\x1a\n", path
    length, kind = struct.unpack(">I4s", d[8:16])
    assert kind == b"IHDR" and length == 13, path
    w, h = struct.unpack(">II", d[16:24])
    assert zlib.crc32(d[12:29]) == struct.unpack(">I", d[29:33])[0], path + ": IHDR CRC"
    assert w == 800 and h > 800, (path, w, h)
    assert d.endswith(b"IEND\xaeB`\x82"), path + ": no IEND"
PY

# 5. fit --config: the comparison block and its physics sentence.
grep -q "^model comparison (tunnelling model with image potential" "$tmp/fit.txt" || fail "no model comparison"
grep -q "the image potential lowers and rounds the barrier, so the apparent barrier height is lower than the mean work function" "$tmp/fit.txt" || fail "no image-potential sentence"
grep -Eq "mean work function 4\.9[0-9]{2} \+- 0\.00[0-9]+ eV" "$tmp/fit.txt" || { cat "$tmp/fit.txt"; fail "fitted work function of the clean curve"; }

# 6. synth errors: exact messages and exit codes.
set +e
"$TIPGAP" synth --out "$tmp/x.csv" --gap 1nm 2> "$tmp/err"; rc=$?
set -e
[ $rc -eq 2 ] || fail "exit $rc for a bad --gap"
[ "$(cat "$tmp/err")" = "tipgap: usage error: --gap: expected a range FROM..TO, e.g. 0.45nm..1nm, got '1nm'" ] || fail "$(cat "$tmp/err")"
set +e
"$TIPGAP" synth --out "$tmp/x.csv" --noise -1pA 2> "$tmp/err"; rc=$?
set -e
[ $rc -eq 2 ] && [ "$(cat "$tmp/err")" = "tipgap: usage error: --noise: must be from 0 to 0.001 A" ] || fail "bad --noise: $rc $(cat "$tmp/err")"
[ ! -e "$tmp/x.csv" ] || fail "a failed synth left a file"
echo "demo_cli: ok"
