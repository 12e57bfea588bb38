#!/usr/bin/env bash
# Regenerates every curve in demo_scans/ (and its .truth.yaml) with tipgap's own synthesiser.
# The output is byte-identical for the same tipgap build inputs: the noise comes from
# std::mt19937_64 with the seed given, and numbers are printed to fixed precision.
# Usage: demo_scans/make_demo_scans.sh [path/to/tipgap]   (default: build/cli/tipgap)
set -euo pipefail
here=$(cd "$(dirname "$0")" && pwd)
tipgap=${1:-${TIPGAP:-$here/../build/cli/tipgap}}
tipgap=$(cd "$(dirname "$tipgap")" && pwd)/$(basename "$tipgap")
cd "$here"
synth() { "$tipgap" synth "$@" > /dev/null; }

# Scenario (imagined): the tip-conditioning log of a low-temperature STM lab, one morning at 4.2 K.
# A tungsten tip is checked on Au(111) after each conditioning step, then on graphite.

# 1. Freshly flashed W tip on Au(111): a clean retract curve, 8 nA down to 1.3 pA.
synth --out 01_w_au111_clean.csv --gap 0.6nm..1nm --bias 100mV --noise 0.1pA --seed 101 \
      --tip-label "W, flashed" --sample-label "Au(111)"
# 2. Same junction on a noisy day (pre-amplifier pickup): the curve runs into a noise floor with
#    a 1.5 pA baseline offset.
synth --out 02_w_au111_floor.csv --gap 0.6nm..1.2nm --bias 100mV --noise 1pA --baseline 1.5pA --seed 102 \
      --tip-label "W, flashed" --sample-label "Au(111)"
# 3. Started too close on the 10 nA range: the amplifier saturates at the close end.
synth --out 03_w_au111_saturated.csv --gap 0.5nm..1nm --bias 100mV --noise 0.1pA --saturation 10nA --seed 103 \
      --tip-label "W, flashed" --sample-label "Au(111)"
# 4. Deliberate gentle contact at 10 mV (low-gain range): a jump to a 1 G0 plateau below 0.38 nm.
synth --out 04_w_au111_contact.csv --gap 0.25nm..0.8nm --bias 10mV --noise 0.2pA --jump-gap 0.38nm \
      --contact-conductance 1 --seed 104 --tip-label "W, flashed" --sample-label "Au(111)"
# 5. Approach then retract at 100 mV with a slow piezo creep of 10 pm over the pair.
synth --out 05_w_au111_pair.csv --gap 0.6nm..1nm --bias 100mV --noise 0.1pA --sweeps approach_retract \
      --drift 0.01nm --seed 105 --tip-label "W, flashed" --sample-label "Au(111)"
# 6. After a crash into the surface: an adsorbate-covered tip with a low work function.
synth --out 06_contaminated_au111.csv --gap 0.6nm..1.05nm --bias 100mV --noise 0.1pA --tip-work-function 3.0eV \
      --seed 106 --tip-label "W, contaminated after a crash" --sample-label "Au(111)"
# 7. The re-flashed tip on freshly cleaved graphite.
synth --out 07_w_graphite.csv --gap 0.6nm..1nm --bias 200mV --noise 0.1pA --sample-material graphite \
      --seed 107 --tip-label "W, re-flashed" --sample-label "graphite (HOPG)"
# 8. The same flashed tip on Au(111), recorded by the lab's older data logger, whose export is laid
#    out otherwise: tab separated, units in parentheses, decimal commas, a time column and an
#    auxiliary channel, no bias or temperature lines, and Z as the piezo extension (it grows as the
#    tip approaches). Made by tipgap synth in tipgap's own layout, then converted here; the truth
#    file is synth's with the new file name. 08_w_au111_export.read.yaml holds the reader options
#    `tipgap demo` reads it with (the same as `tipgap fit 08_w_au111_export.tsv --columns Z,I
#    --flip-z --bias 100mV --temperature 4.2K`).
synth --out 08_w_au111_export.csv --gap 0.6nm..1nm --bias 100mV --noise 0.1pA --seed 108 \
      --tip-label "W, flashed" --sample-label "Au(111)"
LC_ALL=C awk -v OFS='\t' '
  BEGIN { print "# synthetic curve, not a measurement, made by tipgap synth (seed 108) and converted to an export layout by demo_scans/make_demo_scans.sh" }
  /^#/ || /^z / { next }
  {
    split($0, cell, ",")
    z = cell[1]; current = cell[2]
    Z = (z == "0.000000") ? z : "-" z   # the piezo extension: -z
    gsub(/\./, ",", Z); gsub(/\./, ",", current)
    if (n == 0) print "Time (ms)", "Z (nm)", "I (pA)", "Aux (V)"
    print 50 * n++, Z, current, "0,500"
  }' 08_w_au111_export.csv > 08_w_au111_export.tsv
rm 08_w_au111_export.csv
sed -i -e '1i # Converted: 08_w_au111_export.tsv holds this curve with Z = -z (the truth keeps synth'"'"'s z).' \
       -e 's/^file: "08_w_au111_export.csv"/file: "08_w_au111_export.tsv"/' 08_w_au111_export.truth.yaml
cat > 08_w_au111_export.read.yaml <<'YAML'
# How tipgap demo reads 08_w_au111_export.tsv, a synthetic curve in another layout (the tab
# delimiter, the decimal commas and the units in parentheses are detected without options):
# tipgap fit 08_w_au111_export.tsv --columns Z,I --flip-z --bias 100mV --temperature 4.2K
columns: [Z, I]
flip_z: true
bias: 100 mV
temperature: 4.2 K
YAML

# 9. Later that day the current pre-amplifier's input offset has crept to +3 pA (1 pA noise): a
#    retract curve from 100 pA well into the tail, where the offset dominates. A straight line
#    through ln|I| would read kappa about 9 % low; `tipgap demo` fits it with the default offset
#    model (09_w_au111_offset.fit.yaml), which estimates the offset with kappa.
synth --out 09_w_au111_offset.csv --gap 0.8nm..1.3nm --bias 100mV --noise 1pA --baseline 3pA --seed 110 \
      --tip-label "W, flashed" --sample-label "Au(111)"
cat > 09_w_au111_offset.fit.yaml <<'YAML'
# How tipgap demo fits 09_w_au111_offset.csv, a synthetic curve with a +3 pA amplifier offset:
# with the default offset model, as `tipgap fit 09_w_au111_offset.csv` does (the other demo
# curves are fitted with --model linear, the estimand of their expected kappa).
model: offset
YAML

# 10. Resonances (demo_scans/resonances/): the same W tip over a silver monolayer island on Au(111),
#    imagined with a local work function of 4.6 eV. A constant-current z(V) trace at 1 nA from 4 to
#    10 V in 50 mV steps with 2 pm of z noise, for `tipgap resonances` (exact transmission model).
mkdir -p resonances
synth --zv --out resonances/08_w_ag_island_zv.csv --sample-work-function 4.6eV --current 1nA --bias 4V..10V \
      --points 121 --z-noise 2pm --seed 108
