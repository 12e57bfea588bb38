#!/usr/bin/python3
"""Synthetic constant-current z(V) traces from an independent generator, for `tipgap resonances`.

    /usr/bin/python3 zv_trace_check.py <path-to-tipgap>   (ctest) re-checks rows of the traces
    /usr/bin/python3 zv_trace_check.py --write            regenerates tests/data/zv_trace_*.csv

The generator is not tipgap's `synth` (nor any C++): the current density is the SciPy reference of
tests/crosscheck/exact_scipy_check.py (scipy.integrate.solve_ivp through the clamped image barrier,
Gauss-Legendre energy integral), and the gap at each bias is solved with scipy.optimize.brentq on
ln J(s) = ln(I_set / area). Each trace is written noise-free and with seeded Gaussian z noise
(numpy.random.default_rng), with its truth: the sample work function, the noise-free gap at z = 0
and the peaks of the noise-free dz/dV (cubic spline of the dense trace, scipy.interpolate).
Every file says that it is synthetic.
"""
import json
import math
import os
import sys

import numpy as np
from scipy import interpolate, optimize

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import exact_scipy_check as ref  # noqa: E402  (the independent SciPy physics)

HERE = os.path.dirname(os.path.abspath(__file__))
DATA = os.path.join(HERE, "..", "data")
AREA_M2 = 1e-18      # planar 1 nm^2
CURRENT_A = 1e-9     # 1 nA
TEMPERATURE_K = 4.2
BIASES = np.round(np.arange(4.0, 10.0001, 0.05), 4)  # 121 points, 50 mV
Z_OFFSET_NM = 3.2    # z = s - s(first bias) + offset: the instrument's zero is anywhere
Z_NOISE_NM = 0.003   # 3 pm white z noise on the noisy copies

TRACES = [  # name, sample work function (eV), noise seeds
    ("a", 4.8, (11, 12)),
    ("b", 5.5, (21,)),
]


def gap_for_current(j, V, guess=None):
    """Gap (nm) where J(s) = I_set/area at bias V; guess narrows the bracket (ln J falls ~20 per nm)."""
    target = math.log(CURRENT_A / AREA_M2)
    f = lambda s: math.log(ref.current_density(j, s, V, TEMPERATURE_K, panel_eV=0.02)) - target
    lo, hi = (0.3, 4.0) if guess is None else (guess - 0.05, guess + 0.15)
    if f(lo) < 0 or f(hi) > 0:
        lo, hi = 0.3, 4.0
    return optimize.brentq(f, lo, hi, xtol=1e-7, rtol=1e-12)


def peaks_of(biases, gaps):
    spl = interpolate.CubicSpline(biases, gaps)
    fine = np.linspace(biases[0], biases[-1], 6001)
    d = spl(fine, 1)
    out = []
    for i in range(1, len(fine) - 1):
        if d[i] > d[i - 1] and d[i] >= d[i + 1]:
            # Polish on the spline: dz/dV maximal where d2z/dV2 = 0.
            out.append(float(optimize.brentq(lambda v: spl(v, 2), fine[i - 1], fine[i + 1])))
    return out


def write_traces():
    for name, phi_s, seeds in TRACES:
        j = ref.Junction(sample=(phi_s, ref.SAMPLE[1]))
        gaps = []
        for V in BIASES:
            gaps.append(gap_for_current(j, V, gaps[-1] if gaps else None))
        gaps = np.array(gaps)
        z = gaps - gaps[0] + Z_OFFSET_NM
        truth = {
            "source": "tests/crosscheck/zv_trace_check.py (SciPy solve_ivp reference, brentq gap solve)",
            "synthetic": True,
            "tip_work_function_eV": ref.TIP[0], "tip_fermi_energy_eV": ref.TIP[1],
            "sample_work_function_eV": phi_s, "sample_fermi_energy_eV": ref.SAMPLE[1],
            "temperature_K": TEMPERATURE_K, "current_A": CURRENT_A, "area_nm2": AREA_M2 * 1e18,
            "gap_at_z0_nm": float(gaps[0] - Z_OFFSET_NM),
            "peaks_V": peaks_of(BIASES, gaps),
            "z_noise_nm": Z_NOISE_NM,
            "noise_free_z_nm": [float(v) for v in z],
        }
        with open(os.path.join(DATA, f"zv_trace_{name}.truth.json"), "w") as fh:
            json.dump(truth, fh, indent=1)
        for k, seed in enumerate((None,) + seeds):
            zz = z if seed is None else z + np.random.default_rng(seed).normal(0.0, Z_NOISE_NM, len(z))
            suffix = "clean" if seed is None else f"noisy{k}"
            with open(os.path.join(DATA, f"zv_trace_{name}_{suffix}.csv"), "w") as fh:
                fh.write("# synthetic constant-current z(V) trace (imagined W tip over a metal sample), written by\n")
                fh.write("# tests/crosscheck/zv_trace_check.py from its own SciPy physics; truth in zv_trace_"
                         f"{name}.truth.json\n")
                fh.write(f"# current: 1 nA\n# temperature: {TEMPERATURE_K} K\n")
                fh.write(f"# z_noise: {0 if seed is None else Z_NOISE_NM} nm\n# seed: {seed if seed else 'none'}\n")
                fh.write("bias [V],z [nm]\n")
                for V, v in zip(BIASES, zz):
                    fh.write(f"{V:.2f},{v:.7f}\n")
        print(f"trace {name}: phi_s {phi_s} eV, peaks {['%.3f' % p for p in truth['peaks_V']]}")


def check_rows():
    """The committed noise-free traces reproduce: at three biases per trace the gap z + gap_at_z0
    carries the setpoint current to 1e-5 (the z column is written to 1e-7 nm)."""
    failures = []
    for name, phi_s, _ in TRACES:
        with open(os.path.join(DATA, f"zv_trace_{name}.truth.json")) as fh:
            truth = json.load(fh)
        j = ref.Junction(sample=(phi_s, ref.SAMPLE[1]))
        for i in (0, len(BIASES) // 2, len(BIASES) - 1):
            s = truth["noise_free_z_nm"][i] + truth["gap_at_z0_nm"]
            I = ref.current_density(j, s, float(BIASES[i]), TEMPERATURE_K) * AREA_M2
            rel = abs(I / CURRENT_A - 1)
            ok = rel < 1e-5
            print(f"  {'ok  ' if ok else 'FAIL'} trace {name} V={BIASES[i]} V: I = {I:.9e} A (rel {rel:.1e})")
            if not ok:
                failures.append((name, i))
    return failures


def main(argv):
    if len(argv) > 1 and argv[1] == "--write":
        write_traces()
        return 0
    return 1 if check_rows() else 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))
