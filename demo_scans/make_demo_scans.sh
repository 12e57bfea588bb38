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

# 8. Resonances (demo_scans/resonances/): the same W tip over a silver monolayer island on Au(111),
#    imagined with a local work function of 4.6 eV. A constant-current z(V) trace at 1 nA from 4 to
#    10 V in 50 mV steps with 2 pm of z noise, for `tipgap resonances` (exact transmission model).
mkdir -p resonances
synth --zv --out resonances/08_w_ag_island_zv.csv --sample-work-function 4.6eV --current 1nA --bias 4V..10V \
      --points 121 --z-noise 2pm --seed 108
