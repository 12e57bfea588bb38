#pragma once
// The numerical heart of the WKB exponent, shared by the planar barrier and the generic API.
// For a concave U the forbidden set {U > E} is one interval [x1, x2]. The integrand sqrt(U - E)
// has square-root zeros at genuine turning points, so each half of the interval, split at the
// barrier top xm, is mapped by x = x_turn + (xm - x_turn) u^2: the integrand becomes smooth in u
// and Gauss-Legendre converges geometrically. The image potential's poles at the electrodes sit
// at distance ~x1 beyond x1; the u^2 map moves them to |u| ~ sqrt(x1/(xm - x1)), which keeps the
// rule accurate at large gaps.
#include <boost/math/quadrature/gauss.hpp>
#include <boost/math/tools/roots.hpp>
#include <cmath>
#include <cstdint>
#include <utility>

#include "tipgap/core/constants.hpp"

namespace tipgap::detail {

// (2/hbar) sqrt(2 m_e) in J^(-1/2) m^(-1): the WKB exponent per ∫ sqrt(U - E) dx.
inline double wkb_prefactor() {
    static const double p = 2.0 * std::sqrt(2.0 * si::electron_mass) / si::hbar;
    return p;
}

// ∫ sqrt(f(x)) dx over [x1, x2], f = U - E >= 0 inside, split at xm in [x1, x2].
// Points: 20 per half keeps the exponent within 5e-8 absolute up to s = 5 nm (theta ~ 150);
// 30 per half within 1e-11 (both checked against tanh-sinh in tests/transmission_test.cpp).
template <unsigned Points = 30, class F>
double sqrt_integral(const F& f, double x1, double xm, double x2) {
    using rule = boost::math::quadrature::gauss<double, Points>;
    auto half = [&](double x_turn, double L) {
        if (L == 0.0) return 0.0;
        auto g = [&](double u) {
            double x = x_turn + L * u * u;
            double v = f(x);
            return v > 0.0 ? u * std::sqrt(v) : 0.0;
        };
        return 2.0 * std::abs(L) * rule::integrate(g, 0.0, 1.0);
    };
    return half(x1, xm - x1) + half(x2, xm - x2);
}

// ∫ sqrt(u) dx over a length L where u = U - E is linear, from u1 to u2 (both >= 0, not both 0):
// (2/3) L (u1 + sqrt(u1 u2) + u2) / (sqrt(u1) + sqrt(u2)), stable also for u1 = u2.
inline double trapezoid_sqrt_integral(double u1, double u2, double L) {
    double r1 = std::sqrt(u1), r2 = std::sqrt(u2);
    return (2.0 / 3.0) * L * (u1 + r1 * r2 + u2) / (r1 + r2);
}

// The three moments of a forbidden interval that the WKB exponent and its gap and bias derivatives
// need: ∫ sqrt(f) dx, ∫ dx / sqrt(f) and ∫ x dx / sqrt(f), f = U - E.
struct sqrt_moments {
    double root = 0, inverse_root = 0, x_over_root = 0;
};

// The moments over [x1, x2] split at xm, with the same u^2 map and rule as sqrt_integral: the
// first moment is bitwise the value of sqrt_integral<Points> (same nodes, same order of sums), so a
// transmission table built from either gives the same J. Under the map dx / sqrt(f) becomes
// 2 L u du / sqrt(f), which is smooth at a turning point (f ~ f'(x_turn) L u^2 there).
template <unsigned Points, class F>
sqrt_moments sqrt_integral_moments(const F& f, double x1, double xm, double x2) {
    using rule = boost::math::quadrature::gauss<double, Points>;
    static_assert(Points % 2 == 0, "the summation below follows Boost's order for an even rule");
    auto half = [&](double x_turn, double L) {
        sqrt_moments m;
        if (L == 0.0) return m;
        // Boost maps [0, 1] to [-1, 1] as u = 0.5 + 0.5 z and sums (g(z) + g(-z)) w over z > 0.
        auto at = [&](double z, double& root, double& inv, double& xinv) {
            double u = 0.5 + 0.5 * z;
            double x = x_turn + L * u * u;
            double v = f(x);
            root = v > 0.0 ? u * std::sqrt(v) : 0.0;
            inv = v > 0.0 ? u / std::sqrt(v) : 0.0;
            xinv = x * inv;
        };
        double s0 = 0.0, s1 = 0.0, s2 = 0.0;
        for (unsigned i = 0; i < rule::abscissa().size(); ++i) {
            double rp, ip, xp, rm, im, xm_;
            at(rule::abscissa()[i], rp, ip, xp);
            at(-rule::abscissa()[i], rm, im, xm_);
            s0 += (rp + rm) * rule::weights()[i];
            s1 += (ip + im) * rule::weights()[i];
            s2 += (xp + xm_) * rule::weights()[i];
        }
        const double scale = 2.0 * std::abs(L);
        m.root = scale * (0.5 * s0);
        m.inverse_root = scale * (0.5 * s1);
        m.x_over_root = scale * (0.5 * s2);
        return m;
    };
    sqrt_moments a = half(x1, xm - x1), b = half(x2, xm - x2);
    return {a.root + b.root, a.inverse_root + b.inverse_root, a.x_over_root + b.x_over_root};
}

// Root of U(x) = E on [lo, hi] where U - E changes sign; fdf(x) returns (U(x) - E, U'(x)).
// Newton stops once a step is below 2^-31 of x: convergence is quadratic by then, so the root is
// already correct to ~1e-18 relative, and asking for 50 bits only bought one more evaluation.
template <class FdF>
double turning_point(const FdF& fdf, double guess, double lo, double hi) {
    std::uintmax_t iters = 60;
    if (!(guess > lo && guess < hi)) guess = 0.5 * (lo + hi);
    return boost::math::tools::newton_raphson_iterate(fdf, guess, lo, hi, 32, iters);
}

// Maximum of a concave U on (lo, hi) from the sign change of U'; returns x.
template <class DU>
double concave_maximum(const DU& dU, double lo, double hi) {
    double dlo = dU(lo), dhi = dU(hi);
    if (dlo <= 0.0) return lo;
    if (dhi >= 0.0) return hi;
    std::uintmax_t iters = 100;
    auto tol = boost::math::tools::eps_tolerance<double>(50);
    auto r = boost::math::tools::toms748_solve(dU, lo, hi, dlo, dhi, tol, iters);
    return 0.5 * (r.first + r.second);
}

}  // namespace tipgap::detail
