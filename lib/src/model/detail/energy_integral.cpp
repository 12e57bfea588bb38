#include "model/detail/energy_integral.hpp"

#include <algorithm>
#include <cmath>
#include <vector>

#include "model/detail/energy_quadrature.hpp"
#include "model/detail/exponent_table.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/model/barrier.hpp"
#include "tipgap/model/current.hpp"

namespace tipgap::detail {
namespace {

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
    const energy_window w = tsu_esaki_window(b.band_bottom_J(), eV, kT);
    if (w.empty()) return {};

    // Exponent accuracy: an error d in theta is a relative error d in D, so theta to 0.1 rel_tol.
    const exponent_table table(b, w.e_lo, std::min(b.top_J(), w.e_up), 0.1 * o.rel_tol, K >= 2);
    const bool conductance = weight == energy_weight::zero_bias_conductance;
    auto integrand = [&](double E) {
        values<K> out{};
        const double n = conductance ? supply_bias_derivative(E, eV, kT) : supply_function(E, eV, kT);
        if constexpr (K == 1) {
            out[0] = table.transmission(E) * n;
        } else {
            const exponent_sample x = table.sample(E);
            const double D = std::exp(-x.theta);
            out[0] = D * n;
            out[1] = -x.d_ds_per_m * D * n;
            if constexpr (K == 3) out[2] = D * (supply_bias_derivative(E, eV, kT) - x.d_dV_per_V * n);
        }
        return out;
    };
    // The barrier top is a kink of D(E), and theta_s and theta_V jump to zero there.
    const values<K> sum = tsu_esaki_pieces<K>(integrand, w, {b.top_J()}, 0.1 * o.rel_tol);
    energy_integral r;
    r.value = sum[0];
    if constexpr (K >= 2) r.d_ds = sum[1];
    if constexpr (K == 3) {
        r.d_dV = sum[2];
        // The lower limit moves with V when the sample's band bottom is the higher one
        // (e_lo = -eV - E_F,sample): d/dV adds e D(e_lo) N(e_lo) (Leibniz rule).
        if (-eV - o.sample.fermi_energy_J > -o.tip.fermi_energy_J) {
            const double D = std::exp(-table.sample(w.e_lo).theta);
            r.d_dV += si::tsu_esaki_prefactor * si::elementary_charge * D * supply_function(w.e_lo, eV, kT);
        }
    }
    return r;
}

}  // namespace

energy_integral wkb_energy_integral(const model_options& o, double s, double V, int components, energy_weight w) {
    if (components <= 1) return run<1>(o, s, V, w);
    if (components == 2 || w == energy_weight::zero_bias_conductance) return run<2>(o, s, V, w);
    return run<3>(o, s, V, w);
}

}  // namespace tipgap::detail
