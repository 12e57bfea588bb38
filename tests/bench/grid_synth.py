#!/usr/bin/python3
"""Synthetic spectroscopy grid for the map benchmark and tests (synthetic data, not a measurement).

Writes one long CSV, header 'x [nm],y [nm],z [nm],current [pA]', one row per sample, pixels in
row-major order (y outer, x inner), each pixel's samples together, z ascending from 0:
    I(z) = I0 exp(-2 kappa z) + N(0, sigma^2),  kappa = sqrt(2 m phi) / hbar
with phi = --barrier-eV everywhere (pattern uniform), or --disc-barrier-eV inside a centred disc
of radius --disc-radius (a fraction of the smaller grid side, pattern disc). Seeded, so the same
arguments give the same bytes. Used until `tipgap synth --grid` is available.

usage: grid_synth.py OUT.csv --nx 256 --ny 256 --points 128 [--pitch-nm 1] [--pattern disc] [--seed 1]
"""
import argparse
import math
import numpy as np

HBAR = 6.62607015e-34 / (2 * math.pi)  # CODATA 2018
ME = 9.1093837015e-31
EV = 1.602176634e-19


def kappa_per_nm(phi_ev):
    return math.sqrt(2 * ME * phi_ev * EV) / HBAR * 1e-9


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("out")
    ap.add_argument("--nx", type=int, default=256)
    ap.add_argument("--ny", type=int, default=256)
    ap.add_argument("--points", type=int, default=128)
    ap.add_argument("--pitch-nm", type=float, default=1.0)
    ap.add_argument("--pattern", choices=["uniform", "disc"], default="disc")
    ap.add_argument("--barrier-eV", type=float, default=4.0)
    ap.add_argument("--disc-barrier-eV", type=float, default=3.0)
    ap.add_argument("--disc-radius", type=float, default=0.3)
    ap.add_argument("--z-range-nm", type=float, default=0.4)
    ap.add_argument("--i0-pA", type=float, default=1000.0)
    ap.add_argument("--noise-pA", type=float, default=0.5)
    ap.add_argument("--seed", type=int, default=1)
    a = ap.parse_args()
    rng = np.random.default_rng(a.seed)
    z = np.linspace(0.0, a.z_range_nm, a.points)
    z_txt = [f"{v:.5f}" for v in z]
    k_bg, k_disc = kappa_per_nm(a.barrier_eV), kappa_per_nm(a.disc_barrier_eV)
    cx, cy = 0.5 * (a.nx - 1), 0.5 * (a.ny - 1)
    r2 = (a.disc_radius * min(a.nx, a.ny)) ** 2
    row_fmt = "%s,%s,%s,%.5g\n" * a.points
    with open(a.out, "w") as f:
        f.write("# synthetic grid made by tests/bench/grid_synth.py (not a measurement)\n")
        f.write(f"# bias: 100 mV\n# seed: {a.seed}\n# pattern: {a.pattern}\n")
        f.write("x [nm],y [nm],z [nm],current [pA]\n")
        for iy in range(a.ny):
            y_txt = f"{iy * a.pitch_nm:g}"
            inside = (np.arange(a.nx) - cx) ** 2 + (iy - cy) ** 2 <= r2
            kap = np.where(inside & (a.pattern == "disc"), k_disc, k_bg)
            cur = a.i0_pA * np.exp(-2.0 * np.outer(kap, z)) + rng.normal(0.0, a.noise_pA, (a.nx, a.points))
            parts = []
            for ix in range(a.nx):
                x_txt = f"{ix * a.pitch_nm:g}"
                vals = []
                for k in range(a.points):
                    vals += (x_txt, y_txt, z_txt[k], cur[ix, k])
                parts.append(row_fmt % tuple(vals))
            f.write("".join(parts))


if __name__ == "__main__":
    main()
