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

// Root of U(x) = E on [lo, hi] where U - E changes sign; fdf(x) returns (U(x) - E, U'(x)).
template <class FdF>
double turning_point(const FdF& fdf, double guess, double lo, double hi) {
    std::uintmax_t iters = 60;
    if (!(guess > lo && guess < hi)) guess = 0.5 * (lo + hi);
    return boost::math::tools::newton_raphson_iterate(fdf, guess, lo, hi, 50, iters);
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
