#pragma once
// The WKB exponent theta(E) together with its derivatives with respect to the gap s and the bias V
// at fixed normal energy E, from one pass over the barrier (the same turning points and the same
// quadrature nodes as theta itself).
//
// Derivation (Leibniz rule; derived here). In the scaled coordinate xi = x / s the barrier is
//   U = phi_t + (phi_s - eV - phi_t) xi + W(xi s),
// and both image potentials scale as 1/s at fixed xi, so dU/ds|xi = -W/s and dU/dV|xi = -e xi.
// theta = p s ∫ sqrt(U - E) dxi, p = (2/hbar) sqrt(2 m_e). Differentiating under the integral (the
// integrand vanishes at a turning point, and an end of the interval at xi = 0 or 1 does not move):
//   d theta/ds = theta/s - (p / 2s) ∫ W dx / sqrt(U - E)
//              = theta/(2s) + (p / 2s) [(phi_t - E) I0 + k I1],
//   d theta/dV = -(p e / 2s) I1,
// with I0 = ∫ dx / sqrt(U - E), I1 = ∫ x dx / sqrt(U - E) and k = (phi_s - eV - phi_t)/s, using
// W = (U - E) - (phi_t - E + k x). Every term is positive (phi_t - E + k x = U - E - W > 0), so
// nothing cancels. Without an image both follow in closed form (theta_s = theta / s).
#include "tipgap/model/barrier.hpp"

namespace tipgap::detail {

struct exponent_sample {
    double theta = 0;       // WKB exponent (dimensionless)
    double d_ds_per_m = 0;  // d theta / ds at fixed E and V (1/m)
    double d_dV_per_V = 0;  // d theta / dV at fixed E and s (1/V)
};

// theta and its derivatives at E_J (J); all zero at and above the barrier top, where D = 1.
// abs_tol: absolute accuracy of theta; theta is bitwise wkb_exponent(b, E_J, abs_tol).
exponent_sample wkb_exponent_sample(const barrier& b, double E_J, double abs_tol);

// The limit E -> top from below. theta -> 0 but its derivatives do not: the forbidden interval
// shrinks onto the parabolic top, where I0 -> pi sqrt(2 / |U''(xm)|) and I1 -> xm I0. A
// transmission table that ends at the top needs this value at its last node. Only for a barrier
// with an image potential (a smooth top).
exponent_sample wkb_exponent_at_top(const barrier& b);

}  // namespace tipgap::detail
