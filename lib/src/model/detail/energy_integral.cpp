#include "model/detail/energy_integral.hpp"

#include <algorithm>
#include <cmath>
#include <vector>

#include "model/detail/exponent_table.hpp"
#include "model/detail/kronrod.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/model/barrier.hpp"
#include "tipgap/model/current.hpp"

namespace tipgap::detail {
namespace {

// Breakpoints of the energy axis on [e_lo, e_up]: the two Fermi edges (smeared over a few kT), and
// the barrier top, where D(E) has a kink. Each piece is smooth, so Gauss-Kronrod converges fast on
// it. Near a Fermi edge the supply varies on the scale kT with complex poles at +-i pi kT, so the
// edges get cuts at 0, +-4 and +-12 kT: every piece is then resolved by one Gauss-Kronrod rule.
std::vector<double> energy_cuts(double e_lo, double e_up, double top, double e_a, double e_b, double kT) {
    std::vector<double> cuts{e_lo, e_up};
    auto add_cut = [&](double e) {
        if (e > e_lo && e < e_up) cuts.push_back(e);
    };
    add_cut(top);
    for (double edge : {e_a, e_b}) {
        add_cut(edge);
        if (kT > 0.0) {
            for (double m : {-12.0, -4.0, 4.0, 12.0}) add_cut(edge + m * kT);
        }
    }
    std::sort(cuts.begin(), cuts.end());
    cuts.erase(std::unique(cuts.begin(), cuts.end()), cuts.end());
    return cuts;
}

// e f(E + eV): the bias derivative of the supply function, dN/dV (C); at T = 0 a step.
double supply_bias_derivative(double E, double eV, double kT) {
    const double y = E + eV;
    if (kT <= 0.0) return y < 0.0 ? si::elementary_charge : y > 0.0 ? 0.0 : 0.5 * si::elementary_charge;
    // Beyond +-700 kT the Fermi factor is 1 or 0 to far below double precision of the result;
    // returning it skips libm's slow overflow and underflow paths.
    const double z = y / kT;
    if (z > 700.0) return 0.0;
    if (z < -700.0) return si::elementary_charge;
    return si::elementary_charge / (1.0 + std::exp(z));
}

template <std::size_t K>
energy_integral run(const model_options& o, double s, double V, energy_weight weight) {
    barrier b(o, s, V);
    const double eV = si::elementary_charge * V;
    const double kT = si::boltzmann_k * o.temperature_K;
    const double e_a = std::min(0.0, -eV), e_b = std::max(0.0, -eV);
    const double e_lo = b.band_bottom_J();
    // Above e_b the supply falls as e^(-(E - e_b)/kT): 37 kT leaves < 1e-16 of it.
    const double e_up = kT > 0.0 ? e_b + 37.0 * kT : e_b;
    if (!(e_up > e_lo)) return {};
    const std::vector<double> cuts = energy_cuts(e_lo, e_up, b.top_J(), e_a, e_b, kT);

    // Exponent accuracy: an error d in theta is a relative error d in D, so theta to 0.1 rel_tol.
    const exponent_table table(b, e_lo, std::min(b.top_J(), e_up), 0.1 * o.rel_tol, K >= 2);
    // The quadrature runs in eV: Gauss-Kronrod error estimates are meaningful for O(1) lengths.
    constexpr double J_per_eV = si::electron_volt;
    const bool conductance = weight == energy_weight::zero_bias_conductance;
    auto integrand = [&](double e) {
        const double E = e * J_per_eV;
        values<K> out{};
        if constexpr (K == 1) {
            const double n = conductance ? supply_bias_derivative(E, eV, kT) : supply_function(E, eV, kT);
            out[0] = table.transmission(E) * n / J_per_eV;
        } else {
            const exponent_sample x = table.sample(E);
            const double D = std::exp(-x.theta);
            const double n = conductance ? supply_bias_derivative(E, eV, kT) : supply_function(E, eV, kT);
            out[0] = D * n / J_per_eV;
            out[1] = -x.d_ds_per_m * D * n / J_per_eV;
            if constexpr (K == 3) out[2] = D * (supply_bias_derivative(E, eV, kT) - x.d_dV_per_V * n) / J_per_eV;
        }
        return out;
    };
    std::vector<double> cuts_eV(cuts.size());
    for (std::size_t i = 0; i < cuts.size(); ++i) cuts_eV[i] = cuts[i] / J_per_eV;
    const values<K> sum = integrate_pieces<K>(integrand, cuts_eV, 0.1 * o.rel_tol);
    energy_integral r;
    r.value = si::tsu_esaki_prefactor * sum[0] * J_per_eV * J_per_eV;
    if constexpr (K >= 2) r.d_ds = si::tsu_esaki_prefactor * sum[1] * J_per_eV * J_per_eV;
    if constexpr (K == 3) {
        r.d_dV = si::tsu_esaki_prefactor * sum[2] * J_per_eV * J_per_eV;
        // The lower limit moves with V when the sample's band bottom is the higher one
        // (e_lo = -eV - E_F,sample): d/dV adds e D(e_lo) N(e_lo) (Leibniz rule).
        if (-eV - o.sample.fermi_energy_J > -o.tip.fermi_energy_J) {
            const double D = std::exp(-table.sample(e_lo).theta);
            r.d_dV += si::tsu_esaki_prefactor * si::elementary_charge * D * supply_function(e_lo, eV, kT);
        }
    }
    return r;
}

}  // namespace

energy_integral tsu_esaki_integral(const model_options& o, double s, double V, int components, energy_weight w) {
    if (components <= 1) return run<1>(o, s, V, w);
    if (components == 2 || w == energy_weight::zero_bias_conductance) return run<2>(o, s, V, w);
    return run<3>(o, s, V, w);
}

}  // namespace tipgap::detail
