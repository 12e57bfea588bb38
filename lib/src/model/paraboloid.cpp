// The paraboloid tip by Gauss-Laguerre quadrature, with the adaptive paraboloid_integral as the
// fallback and the reference.
#include <cmath>
#include <limits>
#include <numbers>

#include "model/detail/gauss_laguerre.hpp"
#include "model/detail/paraboloid_current.hpp"
#include "tipgap/model/current.hpp"
#include "tipgap/model/geometry.hpp"

namespace tipgap {

paraboloid_laguerre_result paraboloid_integral_laguerre(const std::function<gap_sample(double)>& j, double R,
                                                        double s, double rel_tol, const gap_sample& apex) {
    paraboloid_laguerre_result out;
    const double rate = -apex.d_ds / apex.value;  // 1/m
    if (!(std::isfinite(rate) && rate > 0.0)) return out;
    // The estimate is conservative by a factor 1-3 where the rule's error is above the noise of
    // the samples (measured over the model's domain in tests/model/paraboloid_test.cpp): a quarter of
    // rel_tol leaves the accepted value within rel_tol.
    const double accept = 0.25 * rel_tol;
    for (int n : {4, 8, 16}) {
        const detail::gauss_laguerre_rule& rule = detail::gauss_laguerre(n);
        double direct = 0.0, by_parts = 0.0, carried = 0.0;
        for (int i = 0; i < n; ++i) {
            const gap_sample x = j(s + rule.nodes[i] / rate);
            direct += rule.scaled_weights[i] * x.value;
            by_parts += rule.scaled_weights[i] * (x.value + x.d_ds / rate);
            carried += rule.scaled_weights[i] * x.carried;
        }
        by_parts += apex.value;
        out.nodes = n;
        out.evaluations += n;
        out.value = 2.0 * std::numbers::pi * R * direct / rate;
        out.carried_value = 2.0 * std::numbers::pi * R * carried / rate;
        out.error_estimate = std::abs(direct - by_parts) / std::abs(direct);
        if (out.error_estimate <= accept) {
            out.accepted = true;
            return out;
        }
    }
    return out;
}

namespace detail {

double paraboloid_density_integral(const model_options& m, double R, double s, double V, bool zero_bias,
                                   const gap_sample& apex, double* d_dV) {
    if (d_dV) *d_dV = std::numeric_limits<double>::quiet_NaN();
    auto sample = [&](double gap) -> gap_sample {
        if (zero_bias) {
            const zero_bias_conductance g = zero_bias_conductance_density(m, gap);
            return {g.conductance_density_S_per_m2, g.d_ds_S_per_m3};
        }
        const current_density_slopes d = current_density_derivatives(m, gap, V, d_dV != nullptr);
        return {d.current_density_A_per_m2, d.d_ds_A_per_m3, d_dV ? d.d_dV_S_per_m2 : 0.0};
    };
    if (apex.value == 0.0) return 0.0;
    // The rule needs exact gap derivatives (wkb) and a j without a kink beyond the apex: a barrier
    // that is collapsed at the apex opens again further out, and J has a kink there.
    const bool smooth = m.method == method_kind::wkb && classify(m, s, zero_bias ? 0.0 : V) != regime::barrier_collapsed;
    if (smooth) {
        const paraboloid_laguerre_result r = paraboloid_integral_laguerre(sample, R, s, m.rel_tol, apex);
        if (r.accepted) {
            if (d_dV) *d_dV = r.carried_value;
            return r.value;
        }
    }
    auto value = [&](double gap) {
        return zero_bias ? zero_bias_conductance_density(m, gap).conductance_density_S_per_m2 : current_density(m, gap, V);
    };
    return paraboloid_integral(value, R, s, m.rel_tol);
}

}  // namespace detail

namespace {

// j and dj/ds at the apex from evaluate_point's results: dj/ds = j d ln|j|/ds = -2 kappa j.
gap_sample apex_of(const point_quantities& q, double value) { return {value, -2.0 * q.decay_constant_per_m * value}; }

}  // namespace

double paraboloid_current(const model_options& m, double R, const point_quantities& q) {
    if (q.bias_V == 0.0) return 0.0;
    return detail::paraboloid_density_integral(m, R, q.gap_m, q.bias_V, false, apex_of(q, q.current_density_A_per_m2));
}

paraboloid_current_slopes paraboloid_current_with_bias_slope(const model_options& m, double R,
                                                             const point_quantities& q) {
    paraboloid_current_slopes out;
    if (q.bias_V == 0.0) return out;
    double d_dV = 0.0;
    out.current_A = detail::paraboloid_density_integral(m, R, q.gap_m, q.bias_V, false,
                                                        apex_of(q, q.current_density_A_per_m2), &d_dV);
    if (std::isfinite(d_dV)) {
        out.d_dV_A_per_V = d_dV;
        return out;
    }
    geometry_options g;
    g.kind = geometry_kind::paraboloid;
    g.apex_radius_m = R;
    const double h = bias_step(m, q.bias_V);
    out.d_dV_A_per_V = (total_current(m, g, q.gap_m, q.bias_V + h) - total_current(m, g, q.gap_m, q.bias_V - h)) / (2.0 * h);
    return out;
}

double paraboloid_zero_bias_conductance(const model_options& m, double R, const point_quantities& q) {
    return detail::paraboloid_density_integral(m, R, q.gap_m, 0.0, true,
                                               apex_of(q, q.differential_conductance_density_S_per_m2));
}

}  // namespace tipgap
