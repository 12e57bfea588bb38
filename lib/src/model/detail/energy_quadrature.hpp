#pragma once
// The Tsu-Esaki energy integral J = (4 pi m e/h^3) ∫ T(E) N(E) dE (Tsu & Esaki 1973, Appl. Phys.
// Lett. 22, 562) shared by `wkb` and `exact`: the energy window, its breakpoints at the Fermi edges,
// and the adaptive Gauss-Kronrod pieces (kronrod.hpp). `exact` integrates its transmission function
// with tsu_esaki_integral; `wkb` integrates J and its derivatives on the same nodes with
// tsu_esaki_pieces (energy_integral.cpp).
#include <algorithm>
#include <cmath>
#include <cstddef>
#include <vector>

#include "model/detail/kronrod.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/model/current.hpp"

namespace tipgap::detail {

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

// Breakpoints of the window (J, ascending): its ends, the two Fermi edges (smeared over a few kT),
// and the caller's, e.g. the barrier top, where D(E) has a kink; those outside the window are
// ignored. Each piece is smooth, so Gauss-Kronrod converges fast on it. Near a Fermi edge the supply
// varies on the scale kT with complex poles at +-i pi kT, so the edges get cuts at 0, +-4 and
// +-12 kT: every piece is then resolved by one Gauss-Kronrod rule.
inline std::vector<double> tsu_esaki_cuts(const energy_window& w, const std::vector<double>& extra_cuts) {
    std::vector<double> cuts{w.e_lo, w.e_up};
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
    return cuts;
}

// prefactor ∫ f(E) dE over the window for each of the K components of f (f: E in J -> values<K>,
// each in 1/J of the result over the prefactor), every component to rel_tol of its own total.
// extra_cuts as for tsu_esaki_cuts. Component 0 is the same number for every K (kronrod.hpp).
template <std::size_t K, class F>
values<K> tsu_esaki_pieces(const F& f, const energy_window& w, const std::vector<double>& extra_cuts,
                           double rel_tol) {
    const std::vector<double> cuts = tsu_esaki_cuts(w, extra_cuts);
    // The quadrature runs in eV: Gauss-Kronrod error estimates are meaningful for O(1) lengths.
    constexpr double J_per_eV = si::electron_volt;
    auto integrand = [&](double e) {
        values<K> out = f(e * J_per_eV);
        for (double& v : out) v /= J_per_eV;
        return out;
    };
    std::vector<double> cuts_eV(cuts.size());
    for (std::size_t i = 0; i < cuts.size(); ++i) cuts_eV[i] = cuts[i] / J_per_eV;
    values<K> sum = integrate_pieces<K>(integrand, cuts_eV, rel_tol);
    for (double& v : sum) v = si::tsu_esaki_prefactor * v * J_per_eV * J_per_eV;
    return sum;
}

// J (A/m^2) = prefactor ∫ T(E) N(E) dE over the window, to rel_tol. transmission: E (J) -> T(E);
// extra_cuts: energies (J) where T(E) has a kink or changes its character.
template <class T>
double tsu_esaki_integral(const T& transmission, const energy_window& w, const std::vector<double>& extra_cuts,
                          double rel_tol) {
    auto f = [&](double E) { return values<1>{transmission(E) * supply_function(E, w.eV, w.kT)}; };
    return tsu_esaki_pieces<1>(f, w, extra_cuts, rel_tol)[0];
}

}  // namespace tipgap::detail
