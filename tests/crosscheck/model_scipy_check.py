#!/usr/bin/python3
"""Independent SciPy reference for the planar tunnelling model, compared with `tipgap predict`.

Run by ctest as  /usr/bin/python3 model_scipy_check.py <path-to-tipgap>.
(`--self-check-only` runs only the checks of this reference, without tipgap.)

The model is written here from the physics, not from tipgap's C++ (reference library: SciPy):
  barrier (energies from the tip Fermi level, tip at x = 0, sample at x = s, V = sample bias)
    U(x) = phi_t + (phi_s - eV - phi_t) x/s + W(x),
  exact image potential of an electron between two grounded planes (method of images, summed
  with digamma functions; see image_series_direct for the series it sums)
    W(x) = e^2/(16 pi eps0 K s) [2 gamma + psi(x/s) + psi(1 - x/s)],
  WKB transmission D(E) = exp(-(2/hbar) ∫ sqrt(2m (U - E)) dx) between the two turning points
  (D = 1 above the barrier top), Tsu-Esaki current density
    J = (4 pi m e/h^3) ∫ D(E) N(E) dE,  N(E) = kT ln[(1 + e^{-E/kT}) / (1 + e^{-(E+eV)/kT})],
  E from max(-E_F,tip, -eV - E_F,sample) upward (Simmons 1963, J. Appl. Phys. 34, 1793;
  Tsu & Esaki 1973, Appl. Phys. Lett. 22, 562).
Quadratures ask for epsabs = 0 and epsrel ~1e-10..1e-12 so that this is the reference; tipgap must
agree to REL_TOL.
"""
import json
import math
import os
import subprocess
import sys
import tempfile

import numpy as np
from scipy import integrate, optimize, special

from scipy_common import (COULOMB_EV_NM, EULER_GAMMA, KB_EV, TSU_ESAKI, WKB_PER_NM_SQRT_EV, Checks)  # CODATA 2018, working units

# The agreement demanded of tipgap (issue 2, section 5, test 8).
REL_TOL = 1e-5
# Accuracy asked of this reference's quadratures.
EPSREL_WKB = 1e-12     # WKB exponent (values 5..60): absolute error < 1e-10, i.e. D to 1e-10
EPSREL_ENERGY = 1e-10  # energy integral
QUAD_LIMIT = 200
ENERGY_CHUNK_EV = 0.2


class Junction:
    """Tip/sample electrodes and the gap medium. Energies in eV."""

    def __init__(self, phi_t, ef_t, phi_s, ef_s, K=1.0, image="exact"):
        assert image in ("exact", "none")
        self.phi_t, self.ef_t, self.phi_s, self.ef_s = phi_t, ef_t, phi_s, ef_s
        self.K, self.image = K, image


def sqrt_integral(U, u1, u2, E):
    """∫_{u1}^{u2} sqrt(U(u) - E) du between turning points (or domain ends) u1 < u2."""
    c, r = 0.5 * (u1 + u2), 0.5 * (u2 - u1)
    # u = c - r cos(theta) removes the square-root end points: sqrt(U - E) ~ sin(theta/2) there,
    # so sqrt(U - E) * r sin(theta) is smooth on [0, pi].
    g = lambda th: math.sqrt(max(U(c - r * math.cos(th)) - E, 0.0)) * r * math.sin(th)
    val, _ = integrate.quad(g, 0.0, math.pi, epsabs=0.0, epsrel=EPSREL_WKB, limit=QUAD_LIMIT)
    return val


class Barrier:
    """U(u) in eV at fractional position u = x/s for one gap s (nm) and bias V (V)."""

    def __init__(self, j, s_nm, V):
        self.j, self.s, self.V = j, s_nm, V
        self.slope = j.phi_s - V - j.phi_t  # linear part across the gap, eV
        self.w = COULOMB_EV_NM / (4.0 * j.K * s_nm)  # e^2/(16 pi eps0 K s), eV
        self._find_top()

    def U(self, u):
        val = self.j.phi_t + self.slope * u
        if self.j.image == "exact":
            val += self.w * (2.0 * EULER_GAMMA + special.digamma(u) + special.digamma(1.0 - u))
        return val

    def dU(self, u):  # dU/du, eV
        d = self.slope
        if self.j.image == "exact":
            d += self.w * (special.polygamma(1, u) - special.polygamma(1, 1.0 - u))
        return d

    def _find_top(self):
        if self.j.image == "none":
            self.u_top = 0.0 if self.slope <= 0 else 1.0
        else:
            # Concave barrier: bracket the maximum with a bounded scalar search, then polish it as
            # the root of dU/du (psi' makes dU/du run from +inf to -inf monotonically).
            res = optimize.minimize_scalar(lambda u: -self.U(u), bounds=(1e-9, 1 - 1e-9), method="bounded",
                                           options={"xatol": 1e-12})
            lo, hi = 1e-15, 1 - 1e-15
            u0 = res.x
            if self.dU(u0) > 0:
                lo = u0
            else:
                hi = u0
            self.u_top = optimize.brentq(self.dU, lo, hi, xtol=1e-16, rtol=4 * np.finfo(float).eps, maxiter=500)
        self.top = self.U(self.u_top)

    def turning_points(self, E):
        """Forbidden interval {u: U(u) > E} as (u1, u2); None when E >= top."""
        if E >= self.top:
            return None
        f = lambda u: self.U(u) - E
        xt = dict(xtol=1e-16, rtol=4 * np.finfo(float).eps, maxiter=500)
        if self.j.image == "none":
            u1 = 0.0 if f(0.0) > 0 else optimize.brentq(f, 0.0, self.u_top, **xt)
            u2 = 1.0 if f(1.0) > 0 else optimize.brentq(f, self.u_top, 1.0, **xt)
        else:
            if f(self.u_top) <= 0:  # E within rounding of the top
                return None
            u1 = optimize.brentq(f, 1e-300, self.u_top, **xt)
            u2 = optimize.brentq(f, self.u_top, 1.0 - 1e-16, **xt)
        return u1, u2

    def wkb_exponent(self, E):
        tp = self.turning_points(E)
        if tp is None:
            return 0.0
        return WKB_PER_NM_SQRT_EV * self.s * sqrt_integral(self.U, tp[0], tp[1], E)

    def transmission(self, E):
        return math.exp(-self.wkb_exponent(E))


def supply(E, V, kT):
    """N(E) in eV; E from the tip Fermi level (eV), V sample bias (V), kT (eV), exact T = 0 limit."""
    if kT == 0.0:
        if V >= 0:
            return V if E <= -V else (-E if E < 0.0 else 0.0)
        return V if E <= 0.0 else (E + V if E < -V else 0.0)
    a, b = -E / kT, -(E + V) / kT
    if a > 0 and b > 0:
        # Deep below both Fermi levels: ln(1 + e^a) = a + ln(1 + e^-a); the a - b = V/kT part is exact.
        return V + kT * (math.log1p(math.exp(-a)) - math.log1p(math.exp(-b)))
    return kT * (np.logaddexp(0.0, a) - np.logaddexp(0.0, b))


def current_density(j, s_nm, V, T):
    """J (A/m^2) with the sign of V, for gap s_nm (nm), sample bias V (V), temperature T (K)."""
    bar = Barrier(j, s_nm, V)
    kT = KB_EV * T
    e_min = max(-j.ef_t, -V - j.ef_s)
    top_fermi = max(0.0, -V)  # the higher Fermi level: N vanishes above it at T = 0
    e_max = top_fermi + 80.0 * kT  # above: N < kT e^-80 (D <= 1)
    # Split at the kinks of N (the two Fermi levels, smoothed over a few kT) and of D (the top).
    cuts = {0.0, -V, bar.top}
    if kT > 0:
        for k in (0.0, -V):
            cuts.update({k - 5 * kT, k + 5 * kT})
    edges = [e_min] + sorted(c for c in cuts if e_min < c < e_max) + [e_max]
    integrand = lambda E: bar.transmission(E) * supply(E, V, kT)
    total = 0.0
    for a, b in zip(edges[:-1], edges[1:]):
        # D(E) varies like e^{c E} with c up to ~10/eV: chunks of <= ENERGY_CHUNK_EV keep each
        # Gauss-Kronrod panel well resolved, so quad's error estimate can be trusted (on one long
        # panel it accepted a 21-point rule 2.5e-8 off while claiming 1e-11).
        n = max(1, math.ceil((b - a) / ENERGY_CHUNK_EV))
        for k in range(n):
            lo, hi = a + (b - a) * k / n, a + (b - a) * (k + 1) / n
            if hi > lo:
                val, _ = integrate.quad(integrand, lo, hi, epsabs=0.0, epsrel=EPSREL_ENERGY, limit=QUAD_LIMIT)
                total += val
    return TSU_ESAKI * total


# ---------------------------------------------------------------------------------------------
# Self-checks of this reference (they guard it; each names its source).

def image_series_direct(u, s_nm, K, terms=200000):
    """Method-of-images series for an electron at x = u s between grounded planes at 0 and s:
    W = -(e^2/(16 pi eps0 K s)) [1/u + sum_{n>=1} (1/(n-u) + 1/(n+u) - 2/n)]
    (Simmons 1963, J. Appl. Phys. 34, 1793, eq. 31, summed term by term; tail sum_{n>N} 2u^2/n^3
    ~ u^2/N^2 added)."""
    n = np.arange(1, terms + 1, dtype=float)
    ssum = np.sum(1.0 / (n - u) + 1.0 / (n + u) - 2.0 / n) + u * u / terms**2
    return -COULOMB_EV_NM / (4.0 * K * s_nm) * (1.0 / u + ssum)


def rectangular_zero_bias_closed_form(phi, ef, s_nm):
    """J/V (A m^-2 V^-1) of a rectangular barrier phi (no image) between identical electrodes of
    Fermi energy ef at T = 0 and V -> 0:
      J/V = (4 pi m e^2/h^3) ∫_{-ef}^{0} e^{-b sqrt(phi - E)} dE
          = (4 pi m e^2/h^3) [(2 sqrt(phi)/b + 2/b^2) e^{-b sqrt phi} - (2 sqrt(U)/b + 2/b^2) e^{-b sqrt U}],
    b = 2 s sqrt(2m)/hbar, U = phi + ef (substitute w = phi - E; d/dw of -(2 sqrt(w)/b + 2/b^2) e^{-b sqrt w}
    is e^{-b sqrt w}). Common practice, derived here."""
    b = WKB_PER_NM_SQRT_EV * s_nm
    Ut = phi + ef
    g = lambda w: (2 * math.sqrt(w) / b + 2 / b**2) * math.exp(-b * math.sqrt(w))
    return TSU_ESAKI * (g(phi) - g(Ut))


def self_checks():
    checks = Checks()
    check, failures = checks.check, checks.failures

    print("Self-checks of the SciPy reference:")
    # CODATA-derived coefficient: kappa = 0.5123 A^-1 sqrt(phi/eV) (common practice) = WKB/2 per A.
    check("kappa coefficient 0.5123 1/A (common practice)", WKB_PER_NM_SQRT_EV / 2 / 10, 0.5123, 1e-4)
    # e^2/(4 pi eps0) = 1.439964 eV nm (Forbes 2006, Appl. Phys. Lett. 89, 113122; from memory).
    check("e^2/(4 pi eps0) = 1.439964 eV nm", COULOMB_EV_NM, 1.439964, 1e-6)
    # Digamma closed form against the direct method-of-images series (series truncation ~1e-11).
    j = Junction(4.5, 9.0, 5.3, 5.5, K=1.0, image="exact")
    for s_nm, u, K in ((1.0, 0.5, 1.0), (0.6, 0.1, 1.0), (2.0, 0.27, 2.5), (0.8, 0.93, 1.0)):
        jj = Junction(4.5, 9.0, 4.5, 9.0, K=K, image="exact")
        bar = Barrier(jj, s_nm, 0.0)
        check(f"image digamma = series, s={s_nm} u={u} K={K}", bar.U(u) - 4.5, image_series_direct(u, s_nm, K), 1e-10)
    # Midpoint limit -e^2 ln2/(4 pi eps0 K s) and near-plane limit -e^2/(16 pi eps0 K x) (issue 2).
    bar = Barrier(Junction(4.5, 9.0, 4.5, 9.0, K=2.0), 1.0, 0.0)
    check("image at midpoint = -e^2 ln2/(4 pi eps0 K s)", bar.U(0.5) - 4.5, -COULOMB_EV_NM * math.log(2) / 2.0, 1e-14)
    u = 1e-7
    check("image near a plane -> -e^2/(16 pi eps0 K x)", bar.U(u) - 4.5, -COULOMB_EV_NM / (4 * 2.0 * u * 1.0), 1e-6)
    # Rectangular barrier, T = 0, V -> 0. J/V is even in V for identical electrodes, so at 1 uV the
    # remainder is O(V^2) ~ 1e-12; the quadratures (1e-10) set the tolerance.
    for phi, ef, s_nm in ((4.5, 5.5, 0.6), (5.3, 9.0, 1.0), (3.0, 5.5, 2.0)):
        jr = Junction(phi, ef, phi, ef, image="none")
        V = 1e-6
        check(f"rectangular J/V closed form phi={phi} EF={ef} s={s_nm}", current_density(jr, s_nm, V, 0.0) / V,
              rectangular_zero_bias_closed_form(phi, ef, s_nm), 1e-8)
    # Supply function: stable branches against the plain formula where the latter is accurate,
    # and its T -> 0 limit.
    for E, V, kT in ((-0.3, 0.5, 0.025), (0.1, -0.4, 0.0259), (-0.02, 0.01, 0.0259), (0.05, 0.1, 0.01)):
        plain = kT * math.log((1 + math.exp(-E / kT)) / (1 + math.exp(-(E + V) / kT)))
        check(f"supply N(E={E}, V={V}, kT={kT})", supply(E, V, kT), plain, 1e-13)
    for E, V in ((-0.3, 0.5), (-0.7, 0.5), (0.1, -0.4), (-0.1, -0.4), (0.5, -0.4)):
        t0 = supply(E, V, 0.0)
        check(f"supply T->0 limit E={E} V={V}", supply(E, V, 1e-5) + 1e-300, t0 + 1e-300, 1e-12)
    # The WKB integrator on an image-shaped barrier with two turning points: the Schottky-Nordheim
    # barrier U/phi = 1 - y - f/(4y) (y = eFx/phi) has exponent v(f) b phi^3/2/F, i.e.
    # (3/2) ∫ sqrt(U/phi) dy = v(f) = sqrt(1+l) [E(m) - l K(m)], l = sqrt f, m = (1-l)/(1+l)
    # (Forbes & Deane 2007, Proc. R. Soc. A 463, 2907; scipy.special.ellipk/ellipe take m).
    for f in (0.05, 0.3, 0.8):
        Usn = lambda y, f=f: 1.0 - y - f / (4.0 * y)
        d = math.sqrt(1.0 - f)
        y1 = optimize.brentq(Usn, 1e-300, math.sqrt(f) / 2, xtol=1e-16, rtol=4 * np.finfo(float).eps)
        y2 = optimize.brentq(Usn, math.sqrt(f) / 2, 1.0, xtol=1e-16, rtol=4 * np.finfo(float).eps)
        check(f"SN inner root (1 - sqrt(1-f))/2, f={f}", y1, f / (2 * (1 + d)), 1e-13)
        check(f"SN outer root (1 + sqrt(1-f))/2, f={f}", y2, (1 + d) / 2, 1e-13)
        lf = math.sqrt(f)
        mm = (1 - lf) / (1 + lf)
        v = math.sqrt(1 + lf) * (special.ellipe(mm) - lf * special.ellipk(mm))
        check(f"SN barrier v(f), f={f}", 1.5 * sqrt_integral(Usn, y1, y2, 0.0), v, 1e-11)
    # Sign and antisymmetry: identical electrodes, J(-V) = -J(V).
    js = Junction(4.5, 9.0, 4.5, 9.0)
    check("J(-V) = -J(V) identical electrodes", -current_density(js, 0.8, -0.7, 4.2),
          current_density(js, 0.8, 0.7, 4.2), 1e-9)
    return failures


# ---------------------------------------------------------------------------------------------
# Comparison with tipgap predict.

TIP = (4.5, 9.0)     # work function, Fermi energy (eV): a tungsten-like tip
SAMPLE = (5.3, 5.5)  # a gold-like sample

# (gap nm, bias V) per temperature; V never exactly 0.
POINTS = {
    0.0: [(0.3, 0.1), (0.5, -1.0), (0.7, 2.0), (1.0, -0.05), (1.2, 3.0), (1.5, -3.0), (2.0, 0.5), (0.9, -2.2)],
    4.2: [(0.35, -0.3), (0.6, 0.01), (0.8, -2.5), (1.1, 1.5), (1.4, -0.8), (1.7, 2.7), (2.0, -1.3), (0.45, 3.0)],
    300.0: [(0.4, 0.2), (0.55, -2.9), (0.75, 1.1), (1.0, -0.02), (1.3, 2.2), (1.6, -1.7), (1.9, 0.9), (0.3, -3.0)],
}


def write_config(path, T, tolerance=True):
    lines = [
        "# Written by tests/crosscheck/model_scipy_check.py: dissimilar electrodes, exact image.",
        f"tip: {{work_function: {TIP[0]} eV, fermi_energy: {TIP[1]} eV}}",
        f"sample: {{work_function: {SAMPLE[0]} eV, fermi_energy: {SAMPLE[1]} eV}}",
        "barrier: {image_potential: exact, relative_permittivity: 1}",
        f"temperature: {T} K",
        "method: wkb",
        "geometry: {kind: planar, area: 1 nm^2}",
    ]
    if tolerance:
        lines.append("tolerance: 1e-8")
    with open(path, "w") as fh:
        fh.write("\n".join(lines) + "\n")


def run_predict(exe, cfg, gap_arg, bias_arg, extra=()):
    cmd = [exe, "predict", "--config", cfg, "--gap", gap_arg, f"--bias={bias_arg}", "--format", "json", *extra]
    return subprocess.run(cmd, capture_output=True, text=True, timeout=600)


def make_configs(exe, tmpdir, temperatures):
    """One config per temperature; drops `tolerance` if this predict does not know the key."""
    cfgs, tol_used = {}, True
    for T in temperatures:
        path = os.path.join(tmpdir, f"junction_{T:g}K.yaml")
        write_config(path, T, tolerance=tol_used)
        cfgs[T] = path
    probe = run_predict(exe, cfgs[temperatures[0]], "1nm", "0.1V")
    if probe.returncode != 0 and "tolerance" in probe.stderr:
        tol_used = False
        for T, path in cfgs.items():
            write_config(path, T, tolerance=False)
    return cfgs, tol_used


def compare(exe):
    failures = []
    j = Junction(TIP[0], TIP[1], SAMPLE[0], SAMPLE[1], K=1.0, image="exact")
    with tempfile.TemporaryDirectory() as tmpdir:
        cfgs, tol_used = make_configs(exe, tmpdir, list(POINTS))
        print(f"\ntipgap predict vs SciPy reference (tip {TIP[0]} eV/{TIP[1]} eV, sample {SAMPLE[0]} eV/"
              f"{SAMPLE[1]} eV, exact image, K = 1, predict tolerance {'1e-8' if tol_used else 'default'}):")
        print(f"{'T (K)':>6} {'gap (nm)':>9} {'bias (V)':>9} {'J tipgap (A/m^2)':>24} {'J SciPy (A/m^2)':>24} "
              f"{'rel diff':>9}  regime")
        for T, pts in POINTS.items():
            for s_nm, V in pts:
                ref = current_density(j, s_nm, V, T)
                res = run_predict(exe, cfgs[T], f"{s_nm}nm", f"{V}V")
                if res.returncode != 0:
                    print(f"{T:6g} {s_nm:9.3f} {V:9.3f}  tipgap failed (exit {res.returncode}): {res.stderr.strip()}")
                    failures.append((T, s_nm, V))
                    continue
                p = json.loads(res.stdout)["points"][0]
                got = p["current_density_A_per_m2"]
                echo_ok = (abs(p["gap_nm"] - s_nm) < 1e-12 and abs(p["bias_V"] - V) < 1e-12
                           and abs(p["temperature_K"] - T) < 1e-12)
                rel = abs(got / ref - 1.0) if ref != 0 else math.inf
                ok = rel <= REL_TOL and echo_ok and math.copysign(1, got) == math.copysign(1, V)
                print(f"{T:6g} {s_nm:9.3f} {V:9.3f} {got:24.15e} {ref:24.15e} {rel:9.2e}  "
                      f"{p.get('regime', '?')}{'' if ok else '  <-- FAIL'}{'' if echo_ok else ' (echo mismatch)'}")
                if not ok:
                    failures.append((T, s_nm, V))
    n = sum(len(v) for v in POINTS.values())
    print(f"{n - len(failures)}/{n} points agree to {REL_TOL:g} relative")
    return failures


def main(argv):
    bad = self_checks()
    if bad:
        print(f"reference self-checks failed: {bad}")
        return 1
    if len(argv) > 1 and argv[1] == "--self-check-only":
        return 0
    if len(argv) < 2:
        print("usage: model_scipy_check.py <path-to-tipgap> | --self-check-only")
        return 2
    return 1 if compare(argv[1]) else 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))
