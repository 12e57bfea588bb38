#pragma once
// One fourth-order Magnus step for the Schrödinger equation written as a first-order system,
//   d/dx (psi, psi') = A(x) (psi, psi'),   A = [[0, 1], [v(x), 0]],   v = (2m/hbar^2)(U(x) - E).
// With A1, A2 at the Gauss points x0 + (1/2 -+ sqrt(3)/6) h, the fourth-order Magnus exponent is
//   Omega = (h/2)(A1 + A2) + (sqrt(3)/12) h^2 [A2, A1]
// (the two-point Gauss scheme of Iserles, Munthe-Kaas, Norsett & Zanna 2000, Acta Numerica 9, 215,
// section on Magnus methods; reference from memory, the formula is checked by its fourth-order
// convergence and by the Airy solution in tests/model/exact_transmission_test.cpp). Here [A2, A1] = diag(v1 - v2, v2 - v1), so Omega = [[c, h], [h vbar, -c]] with
// c = (sqrt(3)/12) h^2 (v1 - v2), vbar = (v1 + v2)/2. Omega is traceless, Omega^2 = mu^2 I with
// mu^2 = c^2 + h^2 vbar, and exp(Omega) = C I + S Omega, C = cosh mu, S = sinh(mu)/mu (cos and
// sin of |mu| when mu^2 < 0). The method is symmetric, so its global error is even in the step:
// Richardson extrapolation between a mesh and its halving removes the h^4 term.
#include <cmath>

namespace tipgap::detail {

// Real 2x2 transfer matrix of (psi, psi') with the log of a factor taken out of it:
// the true matrix is exp(log_scale) [[m11, m12], [m21, m22]].
struct transfer_matrix {
    double m11 = 1, m12 = 0, m21 = 0, m22 = 1;
    double log_scale = 0;
};

// Left-multiplies M by exp(Omega) for one step. h: step (m); c: commutator term (dimensionless);
// vh = vbar h (1/m).
inline void magnus_step(transfer_matrix& M, double h, double c, double vh) {
    const double mu2 = c * c + vh * h;
    double C, S;
    if (mu2 > 1.0) {
        // Evanescent step: exp(mu) is taken out into the log scale, so that a long step through a
        // high barrier (mu of hundreds) cannot overflow before renormalise() sees it.
        const double mu = std::sqrt(mu2), q = std::exp(-2.0 * mu);
        C = 0.5 * (1.0 + q);
        S = 0.5 * (1.0 - q) / mu;
        M.log_scale += mu;
    } else if (mu2 > 1e-3) {
        const double mu = std::sqrt(mu2), e = std::exp(mu), ie = 1.0 / e;
        C = 0.5 * (e + ie);
        S = 0.5 * (e - ie) / mu;
    } else if (mu2 < -1e-3) {
        const double mu = std::sqrt(-mu2);
        C = std::cos(mu);
        S = std::sin(mu) / mu;
    } else {
        // Taylor series of cosh(mu) and sinh(mu)/mu in mu^2; |mu^2| <= 1e-3 makes the first
        // dropped terms (mu^10/10!, mu^10/11!) below 1e-21.
        C = 1.0 + mu2 * (1.0 / 2 + mu2 * (1.0 / 24 + mu2 * (1.0 / 720 + mu2 / 40320.0)));
        S = 1.0 + mu2 * (1.0 / 6 + mu2 * (1.0 / 120 + mu2 * (1.0 / 5040 + mu2 / 362880.0)));
    }
    const double e11 = C + S * c, e12 = S * h, e21 = S * vh, e22 = C - S * c;
    const double n11 = e11 * M.m11 + e12 * M.m21, n12 = e11 * M.m12 + e12 * M.m22;
    const double n21 = e21 * M.m11 + e22 * M.m21, n22 = e21 * M.m12 + e22 * M.m22;
    M.m11 = n11;
    M.m12 = n12;
    M.m21 = n21;
    M.m22 = n22;
}

// Takes a factor 1e100 out of M when its dimensionless entries grow past it, so that thick barriers
// (T far below the double range) never overflow; ref_k: a wavenumber (1/m) to weigh m12 and m21.
inline void renormalise(transfer_matrix& M, double ref_k) {
    constexpr double big = 1e100, small = 1e-100;
    const double size = std::abs(M.m11) + std::abs(M.m22) + std::abs(M.m12) * ref_k + std::abs(M.m21) / ref_k;
    if (size < big) return;
    M.m11 *= small;
    M.m12 *= small;
    M.m21 *= small;
    M.m22 *= small;
    M.log_scale += 100.0 * std::log(10.0);
}

}  // namespace tipgap::detail
