// Derivatives of the current density: in one pass of the energy integral for the WKB model, by
// central differences for the other methods; and the quantities `predict` reports at one point.
#include <algorithm>
#include <cmath>
#include <limits>

#include "model/detail/energy_integral.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/model/current.hpp"

namespace tipgap {
namespace {

// Difference steps for the methods without analytic derivatives: large enough that the quadrature
// error (rel_tol) stays far below the difference, small enough that the O(h^2) truncation error is
// below 1e-5 relative (ln J is nearly linear in s).
double gap_step(double s) { return std::min(0.01e-9, 0.25 * s); }
// Linear response: J/V at 1 mV equals dJ/dV(0) to < 1e-5.
constexpr double linear_response_bias_V = 1e-3;

double log_slope(double j_plus, double j_minus, double h) {
    return (std::log(std::abs(j_plus)) - std::log(std::abs(j_minus))) / (2.0 * h);
}

}  // namespace

double bias_step(const model_options& o, double V) {
    // 1 % of V resolves the smooth WKB J(V). The exact J has field-emission resonances of ~0.1 V
    // width in dJ/dV above the sample work function, which a 0.08 V step at 8 V would flatten by
    // ~(0.08/0.1)^2; 0.2 % keeps that truncation below 1 % while the quadrature noise (rel_tol / (0.002
    // V d ln J/dV)) stays far below it.
    const double fraction = o.method == method_kind::exact ? 0.002 : 0.01;
    return std::max(1e-3, fraction * std::abs(V));
}

current_density_slopes current_density_derivatives(const model_options& o, double s, double V, bool bias_derivative) {
    current_density_slopes d;
    if (o.method == method_kind::wkb) {
        const auto r = detail::wkb_energy_integral(o, s, V, bias_derivative ? 3 : 2, detail::energy_weight::current);
        d.current_density_A_per_m2 = r.value;
        d.d_ds_A_per_m3 = r.d_ds;
        d.d_dV_S_per_m2 = bias_derivative ? r.d_dV : std::numeric_limits<double>::quiet_NaN();
        return d;
    }
    d.current_density_A_per_m2 = current_density(o, s, V);
    const double hs = gap_step(s);
    const double jp = current_density(o, s + hs, V), jm = current_density(o, s - hs, V);
    // ln J is nearly linear in s, J itself is not: difference the logarithm where it exists.
    d.d_ds_A_per_m3 = jp != 0.0 && jm != 0.0 ? d.current_density_A_per_m2 * log_slope(jp, jm, hs) : (jp - jm) / (2.0 * hs);
    d.d_dV_S_per_m2 = std::numeric_limits<double>::quiet_NaN();
    if (bias_derivative) {
        const double dV = bias_step(o, V);
        d.d_dV_S_per_m2 = (current_density(o, s, V + dV) - current_density(o, s, V - dV)) / (2.0 * dV);
    }
    return d;
}

zero_bias_conductance zero_bias_conductance_density(const model_options& o, double s) {
    zero_bias_conductance g;
    if (o.method == method_kind::wkb) {
        const auto r = detail::wkb_energy_integral(o, s, 0.0, 2, detail::energy_weight::zero_bias_conductance);
        g.conductance_density_S_per_m2 = r.value;
        g.d_ds_S_per_m3 = r.d_ds;
        return g;
    }
    const double dV = linear_response_bias_V, hs = gap_step(s);
    g.conductance_density_S_per_m2 = (current_density(o, s, dV) - current_density(o, s, -dV)) / (2.0 * dV);
    const double gp = current_density(o, s + hs, dV), gm = current_density(o, s - hs, dV);
    g.d_ds_S_per_m3 = g.conductance_density_S_per_m2 * log_slope(gp, gm, hs);
    return g;
}

point_quantities evaluate_point(const model_options& o, double s, double V) {
    point_quantities p;
    p.gap_m = s;
    p.bias_V = V;
    p.temperature_K = o.temperature_K;
    double dlnj = std::numeric_limits<double>::quiet_NaN();  // d ln|J| / ds (1/m)
    if (V != 0.0) {
        const current_density_slopes d = current_density_derivatives(o, s, V);
        p.current_density_A_per_m2 = d.current_density_A_per_m2;
        p.differential_conductance_density_S_per_m2 = d.d_dV_S_per_m2;
        p.conductance_density_S_per_m2 = d.current_density_A_per_m2 / V;
        if (d.current_density_A_per_m2 != 0.0) {
            dlnj = d.d_ds_A_per_m3 / d.current_density_A_per_m2;
            // d ln|J|/dV = (dJ/dV)/J: from the same pass for wkb, from bias_step differences otherwise.
            p.dlnI_dV_per_V = d.d_dV_S_per_m2 / d.current_density_A_per_m2;
        }
    }
    if (!std::isfinite(dlnj)) {
        // At V = 0 (or where J underflows) use the conductance: J/V has the same s-dependence in the
        // linear-response limit.
        const zero_bias_conductance g = zero_bias_conductance_density(o, s);
        if (V == 0.0) {
            p.differential_conductance_density_S_per_m2 = g.conductance_density_S_per_m2;
            p.conductance_density_S_per_m2 = g.conductance_density_S_per_m2;
        }
        dlnj = g.d_ds_S_per_m3 / g.conductance_density_S_per_m2;
    }
    p.decay_constant_per_m = -0.5 * dlnj;
    p.apparent_barrier_J = si::hbar * si::hbar / (8.0 * si::electron_mass) * dlnj * dlnj;
    p.kind = classify(o, s, V, &p.barrier_top_J, &p.barrier_width_m);
    return p;
}

}  // namespace tipgap
