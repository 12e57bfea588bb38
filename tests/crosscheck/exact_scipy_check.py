#!/usr/bin/python3
"""Independent SciPy reference for `method: exact`, compared with tipgap.

Run by ctest as  /usr/bin/python3 exact_scipy_check.py <path-to-tipgap>.
    --self-check-only   only the checks of this reference (no tipgap);
    --write-table       rewrite tests/data/exact_transmission_scipy.csv from this reference.

The physics is written here from the problem statement, not from tipgap's C++ (reference library:
SciPy). Energies from the tip Fermi level (eV), tip at x = 0, sample at x = s (nm), V = sample bias:
  barrier     U(x) = phi_t + (phi_s - V - phi_t) x/s + W(x),
  image       W(x) = e^2/(16 pi eps0 K s) [2 gamma + psi(x/s) + psi(1 - x/s)]   (method of images),
  surface     U_eff(x) = max(U(x), -EF_t) for x < s/2, max(U(x), -V - EF_s) for x > s/2,
  electrodes  flat band bottoms -EF_t (x < 0) and -V - EF_s (x > s), free-electron mass,
  T(E)        psi'' = (2m/hbar^2)(U_eff - E) psi integrated with scipy.integrate.solve_ivp (DOP853,
              an explicit Runge-Kutta method: nothing in common with tipgap's Magnus matrices) from
              the collector, psi = e^{i k_s (x - s)}, back to x = 0, where psi = A e^{i k_t x} +
              B e^{-i k_t x} gives T = (k_s/k_t)/|A|^2,
  J           (4 pi m e/h^3) ∫ T(E) N(E) dE, N(E) = kT ln[(1 + e^{-E/kT})/(1 + e^{-(E+V)/kT})]
              (Tsu & Esaki 1973, Appl. Phys. Lett. 22, 562), by composite Gauss-Legendre panels
              short enough for the field-emission resonances (convergence checked by halving them).
T(E) is compared with tipgap through tests/data/exact_transmission_scipy.csv (written by this script
with --write-table; on every run the script recomputes each row and checks it), which
tests/model/exact_transmission_test.cpp compares with the library; J through `tipgap predict`.
"""
import json
import math
import os
import subprocess
import sys
import tempfile

import numpy as np
from scipy import integrate, optimize, special

from scipy_common import (COULOMB_EV_NM, EULER_GAMMA, K2, KB_EV, TSU_ESAKI, Checks)  # CODATA 2018, working units

REL_TOL = 1e-5       # agreement demanded of tipgap (issue 12, deliver 3)
TABLE_TOL = 1e-9     # a recomputed row must match the committed table to this (ODE rtol 1e-12)
ODE_RTOL = 1e-12
HERE = os.path.dirname(os.path.abspath(__file__))
TABLE = os.path.join(HERE, "..", "data", "exact_transmission_scipy.csv")

TIP = (4.5, 9.0)     # work function, Fermi energy (eV): the reference tungsten tip (the built-in default before issue 15)
SAMPLE = (5.3, 5.5)  # the built-in gold sample


class Junction:
    def __init__(self, tip=TIP, sample=SAMPLE, K=1.0, image=True):
        self.phi_t, self.ef_t = tip
        self.phi_s, self.ef_s = sample
        self.K, self.image = K, image


class Gap:
    """U_eff on [0, s] and its smooth pieces for one junction, gap s (nm) and bias V (V)."""

    def __init__(self, j, s, V):
        self.j, self.s, self.V = j, s, V
        self.bb_t, self.bb_s = -j.ef_t, -V - j.ef_s
        self.breaks = [0.0] + self._clamp_points() + [s]

    def U(self, x):
        j, s = self.j, self.s
        u = j.phi_t + (j.phi_s - self.V - j.phi_t) * x / s
        if j.image:
            a = x / s
            u += COULOMB_EV_NM / (4.0 * j.K * s) * (2 * EULER_GAMMA + special.digamma(a) + special.digamma(1 - a))
        return u

    def U_eff(self, x):
        bottom = self.bb_t if x < 0.5 * self.s else self.bb_s
        if x <= 0.0 or x >= self.s:
            return bottom
        return max(self.U(x), bottom)

    def _clamp_points(self):
        """Where U crosses the band bottom of its half (U -> -inf at both surfaces with the image)."""
        s, pts = self.s, []
        for lo, hi, bb in ((0.0, 0.5 * s, self.bb_t), (0.5 * s, s, self.bb_s)):
            f = lambda x, bb=bb: self.U(x) - bb
            grid = np.linspace(lo, hi, 2001)[1:-1]
            vals = [f(x) for x in grid]
            for a, b, fa, fb in zip(grid[:-1], grid[1:], vals[:-1], vals[1:]):
                if fa * fb < 0:
                    pts.append(optimize.brentq(f, a, b, xtol=1e-15, rtol=1e-15))
            if self.j.image:  # between the surface and the first grid point
                near = grid[0] if lo == 0.0 else grid[-1]
                end = 1e-12 * s if lo == 0.0 else s * (1 - 1e-12)
                if f(near) > 0 > f(end):
                    pts.append(optimize.brentq(f, min(end, near), max(end, near), xtol=1e-17, rtol=1e-15))
        return sorted(pts)

    def transmission(self, E):
        """T at the energies E (array, eV), all above both band bottoms."""
        E = np.atleast_1d(np.asarray(E, dtype=float))
        kt = np.sqrt(K2 * (E - self.bb_t))
        ks = np.sqrt(K2 * (E - self.bb_s))
        n = len(E)

        def rhs(x, y):
            return np.concatenate([y[n:], K2 * (self.U_eff(x) - E) * y[:n]])

        y = np.concatenate([np.ones(n, dtype=complex), 1j * ks])
        for a, b in zip(self.breaks[::-1][:-1], self.breaks[::-1][1:]):  # from s down to 0
            if a - b <= 0:
                continue
            sol = integrate.solve_ivp(rhs, (a, b), y, method="DOP853", rtol=ODE_RTOL, atol=1e-30)
            assert sol.success, sol.message
            y = sol.y[:, -1]
        A = 0.5 * (y[:n] + y[n:] / (1j * kt))
        return (ks / kt) / np.abs(A) ** 2


def supply(E, V, kT):
    """N(E) (eV) for an array E, with its exact kT = 0 limit."""
    E = np.asarray(E, dtype=float)
    if kT == 0.0:
        return np.clip(-E, 0, None) - np.clip(-E - V, 0, None)
    return kT * (np.logaddexp(0.0, -E / kT) - np.logaddexp(0.0, -(E + V) / kT))


GL_NODES = 12


def current_density(j, s, V, T, panel_eV=0.02):
    """J (A/m^2) with the sign of V, composite Gauss-Legendre in E on panels of <= panel_eV."""
    gap = Gap(j, s, V)
    kT = KB_EV * T
    lo = max(gap.bb_t, gap.bb_s)
    top = max(0.0, -V) + 40.0 * kT
    cuts = {lo, top, 0.0, -V}
    if kT > 0:
        for edge in (0.0, -V):
            cuts.update(edge + m * kT for m in (-20, -8, -3, 3, 8, 20))
    cuts = sorted(c for c in cuts if lo <= c <= top)
    x, w = np.polynomial.legendre.leggauss(GL_NODES)
    Es, Ws = [], []
    for a, b in zip(cuts[:-1], cuts[1:]):
        # Square-root start at the band bottom: E = lo + t^2 makes the integrand smooth in t.
        m = max(1, math.ceil((b - a) / panel_eV))
        for k in range(m):
            pa, pb = a + (b - a) * k / m, a + (b - a) * (k + 1) / m
            if pa == lo:
                ta, tb = 0.0, math.sqrt(pb - lo)
                t = 0.5 * (ta + tb) + 0.5 * (tb - ta) * x
                Es.append(lo + t * t)
                Ws.append(0.5 * (tb - ta) * w * 2 * t)
            else:
                Es.append(0.5 * (pa + pb) + 0.5 * (pb - pa) * x)
                Ws.append(0.5 * (pb - pa) * w)
    Es, Ws = np.concatenate(Es), np.concatenate(Ws)
    return TSU_ESAKI * np.sum(Ws * gap.transmission(Es) * supply(Es, V, kT))


# ---------------------------------------------------------------------------------------------
# Self-checks of this reference.

def self_checks():
    checks = Checks()
    check, failures = checks.check, checks.failures

    print("Self-checks of the SciPy reference:")
    check("2m/hbar^2 = 26.2468 nm^-2 eV^-1 (common practice, no source)", K2, 26.2468, 1e-5)
    # Rectangular barrier between identical electrodes (Griffiths, Introduction to Quantum
    # Mechanics, 2nd ed., problem 2.33, from memory): T = [1 + V0^2 sinh^2(kappa a)/(4 E (V0 - E))]^-1, with E and
    # V0 from the band bottom.
    jr = Junction(tip=(4.0, 5.0), sample=(4.0, 5.0), image=False)
    for s, e in ((0.3, -1.0), (1.0, 0.0), (1.5, 2.0)):
        Ek, V0 = e + 5.0, 9.0
        kap = math.sqrt(K2 * (V0 - Ek))
        want = 1.0 / (1.0 + V0**2 * math.sinh(kap * s) ** 2 / (4 * Ek * (V0 - Ek)))
        check(f"rectangle s={s} E={e}", Gap(jr, s, 0.0).transmission(e)[0], want, 1e-9)
    # Composite Gauss-Legendre converged: halving the panels changes J by < 1e-8, also with
    # resonances (8 V) and at 4.2 K.
    j = Junction()
    for s, V, T in ((0.8, 0.1, 0.0), (1.4, 8.0, 0.0), (1.0, 2.0, 4.2)):
        check(f"J panels halved s={s} V={V} T={T}", current_density(j, s, V, T, 0.01), current_density(j, s, V, T), 1e-8)
    return failures


# ---------------------------------------------------------------------------------------------
# T(E) table (12 rows; with the image and the default surface model unless image = 0).

T_POINTS = [  # (gap nm, bias V, E eV, image)
    (0.5, 0.1, -0.05, 1), (1.0, 0.1, -0.05, 1), (1.5, -0.1, 0.0, 1), (0.8, 2.0, -1.0, 1),
    (1.2, -1.5, 0.5, 1), (0.6, 1.0, -6.0, 1), (1.5, 7.0, -0.2, 1), (1.5, 7.0, -1.3, 1),
    (2.0, 9.0, -0.4, 1), (1.0, 6.0, -5.5, 1), (1.0, 3.0, -2.0, 0), (0.7, -4.0, 1.0, 0),
]


def write_table():
    rows = []
    for s, V, E, img in T_POINTS:
        T = Gap(Junction(image=bool(img)), s, V).transmission(E)[0]
        rows.append(f"{s},{V},{E},{img},{T:.15e}")
    with open(TABLE, "w") as fh:
        fh.write("# T(E) of the reference junction (W tip 4.5 eV / E_F 9.0 eV, Au sample 5.3 eV / E_F 5.5 eV,\n")
        fh.write("# K = 1), exact image with the default surface model (image = 1) or none (image = 0).\n")
        fh.write("# Source: scipy.integrate.solve_ivp (DOP853, rtol 1e-12) in tests/crosscheck/exact_scipy_check.py;\n")
        fh.write("# rows reproduce to ~1e-10 relative. E from the tip Fermi level.\n")
        fh.write("gap_nm,bias_V,energy_eV,image,transmission\n")
        fh.write("\n".join(rows) + "\n")


def check_table():
    failures = []
    print("\nT(E) table recomputed:")
    with open(TABLE) as fh:
        lines = [l for l in fh if not l.startswith("#")][1:]
    if len(lines) < 10:
        failures.append("table has fewer than 10 rows")
    for line in lines:
        s, V, E, img, T = (float(v) for v in line.split(","))
        got = Gap(Junction(image=bool(img)), s, V).transmission(E)[0]
        rel = abs(got / T - 1)
        ok = rel <= TABLE_TOL
        print(f"  {'ok  ' if ok else 'FAIL'} s={s} V={V} E={E} image={int(img)}: {got:.12e} (table {T:.12e}, rel {rel:.1e})")
        if not ok:
            failures.append(line)
    return failures


# ---------------------------------------------------------------------------------------------
# J against tipgap predict.

J_POINTS = [  # (gap nm, bias V, temperature K)
    (0.5, 0.1, 0.0), (1.0, 0.01, 0.0), (1.2, -1.0, 0.0), (0.8, 2.5, 0.0), (1.5, -3.0, 0.0),
    (1.0, 6.0, 0.0), (1.4, 8.0, 0.0), (1.8, 9.5, 0.0), (0.9, 0.3, 4.2), (1.3, 7.0, 4.2),
]


def write_config(path, T):
    lines = [
        "# Written by tests/crosscheck/exact_scipy_check.py",
        f"tip: {{work_function: {TIP[0]} eV, fermi_energy: {TIP[1]} eV}}",
        f"sample: {{work_function: {SAMPLE[0]} eV, fermi_energy: {SAMPLE[1]} eV}}",
        "barrier: {image_potential: exact, relative_permittivity: 1}",
        f"temperature: {T} K",
        "method: exact",
        "geometry: {kind: planar, area: 1 nm^2}",
    ]
    with open(path, "w") as fh:
        fh.write("\n".join(lines) + "\n")


def compare_current(exe):
    failures = []
    j = Junction()
    print("\ntipgap predict (method: exact, default tolerance) vs SciPy J:")
    with tempfile.TemporaryDirectory() as tmp:
        for s, V, T in J_POINTS:
            cfg = os.path.join(tmp, f"j{T:g}.yaml")
            write_config(cfg, T)
            res = subprocess.run([exe, "predict", "--config", cfg, "--gap", f"{s}nm", f"--bias={V}V", "--format", "json"],
                                 capture_output=True, text=True, timeout=600)
            if res.returncode != 0:
                print(f"  FAIL s={s} V={V}: tipgap exit {res.returncode}: {res.stderr.strip()}")
                failures.append((s, V, T))
                continue
            got = json.loads(res.stdout)["points"][0]["current_density_A_per_m2"]
            ref = current_density(j, s, V, T)
            rel = abs(got / ref - 1)
            ok = rel <= REL_TOL
            print(f"  {'ok  ' if ok else 'FAIL'} s={s} nm V={V} V T={T} K: {got:.12e} vs {ref:.12e} (rel {rel:.2e})")
            if not ok:
                failures.append((s, V, T))
    return failures


def main(argv):
    if len(argv) > 1 and argv[1] == "--write-table":
        write_table()
        return 0
    bad = self_checks() + check_table()
    if bad or (len(argv) > 1 and argv[1] == "--self-check-only"):
        return 1 if bad else 0
    if len(argv) < 2:
        print("usage: exact_scipy_check.py <path-to-tipgap> | --self-check-only | --write-table")
        return 2
    return 1 if compare_current(argv[1]) else 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))
