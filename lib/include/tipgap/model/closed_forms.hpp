#pragma once
// Closed-form tunnelling results used as the fast `method: simmons` and as cross-checks.
// All SI unless a name says otherwise.

namespace tipgap {

// Simmons 1963 (J. Appl. Phys. 34, 1793, eq. 20) intermediate-voltage formula with beta = 1:
//   J = e/(2 pi h ds^2) { phibar exp(-A sqrt(phibar)) - (phibar + eV) exp(-A sqrt(phibar + eV)) },
//   A = 2 ds sqrt(2m)/hbar.
// phibar_J: mean barrier above the emitting Fermi level (J), > 0; width_m: ds (m), > 0;
// eV_J: e|V| (J), >= 0. Returns |J| (A/m^2).
double simmons_intermediate(double phibar_J, double width_m, double eV_J);

// Simmons 1963 rectangular barrier with the image force for identical electrodes, eqs. 35-37
// (closed-form turning points s1, s2 and mean barrier) for eV < phi0. Returns |J| (A/m^2).
// phi0_J: barrier height (J); gap_m: s (m); eV_J: e|V| (J); K: relative permittivity.
double simmons_image(double phi0_J, double gap_m, double eV_J, double K);

// The barrier behind simmons_image: Simmons 1963 closed-form turning points s1 < s2 (m, measured
// from the emitting electrode) and the mean barrier height phibar (J) over [s1, s2] of
//   U(x) = phi0 - eV x/s - 1.15 lambda s^2/(x (s - x)),  lambda = e^2 ln2/(16 pi eps0 K s)  (SI),
//   s1 = 1.2 lambda s/phi0,  s2 = s [1 - 9.2 lambda/(3 phi0 + 4 lambda - 2 eV)] + s1,
//   phibar = phi0 - (eV/2s)(s1 + s2) - [1.15 lambda s/(s2 - s1)] ln[s2 (s - s1)/(s1 (s - s2))].
// Arguments as simmons_image. Throws tipgap::error (input) for eV >= phi0 or a non-positive
// argument, (no_answer) when the image force closes the barrier (s2 <= s1, s2 >= s or phibar <= 0).
struct simmons_image_result {
    double lambda_J = 0;  // lambda (J)
    double s1_m = 0;      // inner turning point (m)
    double s2_m = 0;      // outer turning point (m)
    double phibar_J = 0;  // mean barrier above the emitting Fermi level (J)
};
simmons_image_result simmons_image_barrier(double phi0_J, double gap_m, double eV_J, double K);

// Fowler-Nordheim constants (Forbes 2006 conventions): a_FN = e^3/(8 pi h) (A eV V^-2),
// b_FN = (4/3) sqrt(2 m_e) / (e hbar) in eV^(-3/2) V nm^-1 (6.830890).
double fn_a_A_eV_per_V2();
double fn_b_per_eV32_V_per_nm();

// Scaled barrier field f = (e^3 F / (4 pi eps0)) / phi^2. F_V_per_m: field (V/m); phi_J: work function (J).
double scaled_barrier_field(double F_V_per_m, double phi_J);

// Schottky-Nordheim barrier functions, exact elliptic-integral forms (Forbes & Deane 2007,
// Proc. R. Soc. A 463, 2907): v(f) = sqrt(1+l) [E(m) - l K(m)], l = sqrt(f), m = (1-l)/(1+l);
// t(f) = v(f) - (4/3) f dv/df. f in [0, 1].
double sn_v_exact(double f);
double sn_t_exact(double f);
// Forbes 2006 (Appl. Phys. Lett. 89, 113122) approximations: v ≈ 1 - f + (f/6) ln f,
// t ≈ 1 + f/9 - (f/18) ln f. f in (0, 1].
double sn_v_forbes(double f);
double sn_t_forbes(double f);

// Elementary Fowler-Nordheim current density J = a F^2/phi exp(-b phi^{3/2}/F) (A/m^2).
// F_V_per_m: field (V/m), > 0; phi_J: work function (J), > 0.
double fowler_nordheim_elementary(double F_V_per_m, double phi_J);
// Murphy-Good: J = a F^2/(phi t(f)^2) exp(-v(f) b phi^{3/2}/F) (A/m^2), f <= 1.
double murphy_good(double F_V_per_m, double phi_J);

}  // namespace tipgap
