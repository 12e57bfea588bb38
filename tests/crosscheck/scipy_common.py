"""Shared by the SciPy cross-checks in this folder: CODATA 2018 constants in the working units
(eV, nm, V) and the small pass/fail recorder every reference self-check prints through.

Not a check itself (ctest runs only *_check.py). Nothing here comes from tipgap's C++.
"""
import math

import numpy as np

# ---- CODATA 2018 (NIST SP 961, 2019; physics.nist.gov/constants) ----
H = 6.62607015e-34          # Planck constant, J s (exact)
HBAR = H / (2.0 * math.pi)  # J s
E_CHARGE = 1.602176634e-19  # elementary charge, C (exact)
K_B = 1.380649e-23          # Boltzmann constant, J/K (exact)
M_E = 9.1093837015e-31      # electron mass, kg
EPS0 = 8.8541878128e-12     # vacuum permittivity, F/m

# Working units: energies in eV, lengths in nm, bias in V (so eV in eV equals V numerically).
COULOMB_EV_NM = E_CHARGE / (4.0 * math.pi * EPS0) * 1e9      # e^2/(4 pi eps0) = 1.439964... eV nm
WKB_PER_NM_SQRT_EV = 2.0 * math.sqrt(2.0 * M_E * E_CHARGE) / HBAR * 1e-9  # (2/hbar) sqrt(2 m), nm^-1 eV^-1/2
K2 = 2.0 * M_E * E_CHARGE / HBAR**2 * 1e-18                  # 2m/hbar^2, nm^-2 eV^-1
TSU_ESAKI = 4.0 * math.pi * M_E * E_CHARGE / H**3 * E_CHARGE**2  # A m^-2 per eV^2
KB_EV = K_B / E_CHARGE                                         # eV/K
EULER_GAMMA = float(np.euler_gamma)


class Checks:
    """Collects named relative-error checks; `check` prints one line each, `failures` lists the
    names that missed their tolerance."""

    def __init__(self):
        self.failures = []

    def check(self, name, got, want, tol):
        rel = abs(got / want - 1.0)
        ok = rel <= tol
        print(f"  {'ok  ' if ok else 'FAIL'} {name}: {got:.12e} vs {want:.12e} (rel {rel:.2e}, tol {tol:.0e})")
        if not ok:
            self.failures.append(name)
