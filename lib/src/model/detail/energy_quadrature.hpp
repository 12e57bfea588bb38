#pragma once
// The Tsu-Esaki energy integral J = (4 pi m e/h^3) ∫ T(E) N(E) dE shared by `wkb` and `exact`:
// the energy window, its breakpoints at the Fermi edges, and the adaptive Gauss-Kronrod pieces.
// (Moved from current.cpp unchanged, so that both methods integrate the same way.)
#include <algorithm>
#include <boost/math/quadrature/gauss_kronrod.hpp>
#include <cmath>
#include <initializer_list>
#include <vector>

#include "tipgap/core/constants.hpp"
#include "tipgap/model/current.hpp"

namespace tipgap::detail {

// Adaptive bisection around Boost's 15-point Gauss-Kronrod pair, to an absolute tolerance. Each
// piece is mapped onto [-1, 1] before the rule is applied, because Boost 1.74's own recursion
// compares the unscaled error estimate with the scaled integral and so over-refines short pieces.
template <class F>
double gauss_kronrod_piece(const F& f, double a, double b, double* err) {
    using gk = boost::math::quadrature::gauss_kronrod<double, 15>;
    const double mid = 0.5 * (a + b), half = 0.5 * (b - a);
    auto g = [&](double t) { return f(mid + half * t); };
    double e = 0.0;
    double est = half * gk::integrate(g, -1.0, 1.0, 0, 0.0, &e);
    *err = e * half;
    return est;
}

template <class F>
double adaptive_gauss_kronrod(const F& f, double a, double b, double est, double err, double abs_tol, int depth) {
    if (depth <= 0 || err <= abs_tol) return est;
    const double mid = 0.5 * (a + b);
    double e1 = 0, e2 = 0;
    double r1 = gauss_kronrod_piece(f, a, mid, &e1), r2 = gauss_kronrod_piece(f, mid, b, &e2);
    return adaptive_gauss_kronrod(f, a, mid, r1, e1, 0.5 * abs_tol, depth - 1) +
           adaptive_gauss_kronrod(f, mid, b, r2, e2, 0.5 * abs_tol, depth - 1);
}

// ∫ f over consecutive pieces [cuts[i], cuts[i+1]] to a relative tolerance of the whole sum: one
// rule per piece first, then refinement only where a piece's error matters for the total.
template <class F>
double integrate_pieces(const F& f, const std::vector<double>& cuts, double rel_tol) {
    const std::size_t n = cuts.size() - 1;
    std::vector<double> est(n), err(n);
    double total = 0.0;
    for (std::size_t i = 0; i < n; ++i) {
        est[i] = gauss_kronrod_piece(f, cuts[i], cuts[i + 1], &err[i]);
        total += est[i];
    }
    const double abs_tol = rel_tol * std::abs(total) / static_cast<double>(n);
    double sum = 0.0;
    for (std::size_t i = 0; i < n; ++i) sum += adaptive_gauss_kronrod(f, cuts[i], cuts[i + 1], est[i], err[i], abs_tol, 16);
    return sum;
}

// The energies that carry current (J, from the tip Fermi level).
struct energy_window {
    double eV = 0, kT = 0;  // e V and k_B T (J)
    double e_a = 0, e_b = 0;  // the lower and the higher Fermi level
    double e_lo = 0, e_up = 0;  // integration range: the higher band bottom to e_b + 37 kT
    bool empty() const { return !(e_up > e_lo); }
};

inline energy_window tsu_esaki_window(double band_bottom_J, double eV, double kT) {
    energy_window w;
    w.eV = eV;
    w.kT = kT;
    w.e_a = std::min(0.0, -eV);
    w.e_b = std::max(0.0, -eV);
    w.e_lo = band_bottom_J;
    // Above e_b the supply falls as e^(-(E - e_b)/kT): 37 kT leaves < 1e-16 of it.
    w.e_up = kT > 0.0 ? w.e_b + 37.0 * kT : w.e_b;
    return w;
}

// J (A/m^2) = prefactor ∫ T(E) N(E) dE over the window, to rel_tol. extra_cuts: energies (J) where
// T(E) has a kink or changes its character; those outside the window are ignored.
template <class T>
double tsu_esaki_integral(const T& transmission, const energy_window& w, const std::vector<double>& extra_cuts,
                          double rel_tol) {
    // Breakpoints: the two Fermi edges (smeared over a few kT), and the caller's, e.g. the barrier
    // top, where D(E) has a kink. Each piece is smooth, so Gauss-Kronrod converges fast on it.
    std::vector<double> cuts{w.e_lo, w.e_up};
    // Near a Fermi edge the supply varies on the scale kT with complex poles at +-i pi kT, so the
    // edges get cuts at 0, +-4 and +-12 kT: every piece is then resolved by one Gauss-Kronrod rule.
    auto add_cut = [&](double e) {
        if (e > w.e_lo && e < w.e_up) cuts.push_back(e);
    };
    for (double e : extra_cuts) add_cut(e);
    for (double edge : {w.e_a, w.e_b}) {
        add_cut(edge);
        if (w.kT > 0.0) {
            for (double m : {-12.0, -4.0, 4.0, 12.0}) add_cut(edge + m * w.kT);
        }
    }
    std::sort(cuts.begin(), cuts.end());
    cuts.erase(std::unique(cuts.begin(), cuts.end()), cuts.end());

    // The quadrature runs in eV: Boost's Gauss-Kronrod compares its unscaled error estimate with
    // the scaled integral, which only works for O(1) interval lengths.
    constexpr double J_per_eV = si::electron_volt;
    auto integrand = [&](double e) {
        double E = e * J_per_eV;
        return transmission(E) * supply_function(E, w.eV, w.kT) / J_per_eV;
    };
    std::vector<double> cuts_eV(cuts.size());
    for (std::size_t i = 0; i < cuts.size(); ++i) cuts_eV[i] = cuts[i] / J_per_eV;
    double sum = integrate_pieces(integrand, cuts_eV, rel_tol);
    return si::tsu_esaki_prefactor * sum * J_per_eV * J_per_eV;
}

}  // namespace tipgap::detail
