#pragma once
// Physical constants, CODATA 2018 (NIST SP 961, 2019; physics.nist.gov/constants). SI units.
#include <numbers>

namespace tipgap::si {

inline constexpr double planck_h = 6.62607015e-34;            // J s (exact)
inline constexpr double hbar = planck_h / (2.0 * std::numbers::pi);  // J s
inline constexpr double elementary_charge = 1.602176634e-19;  // C (exact)
inline constexpr double boltzmann_k = 1.380649e-23;           // J/K (exact)
inline constexpr double electron_mass = 9.1093837015e-31;     // kg (rel. unc. 3.0e-10)
inline constexpr double vacuum_permittivity = 8.8541878128e-12;  // F/m (rel. unc. 1.5e-10)
inline constexpr double electron_volt = elementary_charge;   // J per eV
// J per meV (exact). The decimal is written out because elementary_charge * 1e-3 rounds to the
// neighbouring double, and "100 meV" has always been read with this factor.
inline constexpr double millielectron_volt = 1.602176634e-22;
// Conductance quantum G0 = 2e^2/h (exact in SI 2019).
inline constexpr double conductance_quantum = 2.0 * elementary_charge * elementary_charge / planck_h;  // S
// Prefactor of the Tsu-Esaki current density, 4 pi m e / h^3 (A m^-2 J^-2).
inline constexpr double tsu_esaki_prefactor =
    4.0 * std::numbers::pi * electron_mass * elementary_charge / (planck_h * planck_h * planck_h);
// e^2/(4 pi eps0), the Coulomb energy scale (J m).
inline constexpr double coulomb_e2 =
    elementary_charge * elementary_charge / (4.0 * std::numbers::pi * vacuum_permittivity);

}  // namespace tipgap::si
