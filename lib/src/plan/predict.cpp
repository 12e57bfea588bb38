#include "tipgap/core/limits.hpp"
#include "tipgap/plan/predict.hpp"

#include <cmath>
#include <fmt/format.h>

#include "core/detail/parallel.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/model/geometry.hpp"
#include "tipgap/plan/warnings.hpp"

namespace tipgap {

void validate_operating_point(const model_options& m, double gap, double bias, const std::string& gap_key,
                              const std::string& bias_key) {
    location w;
    if (!(std::isfinite(gap) && gap > 0.0)) {
        w.key = gap_key;
        throw_input(w, fmt::format("gap {:g} nm is not positive; expected a gap in (0, 100] nm", gap * 1e9));
    }
    if (!at_most(gap, 100e-9)) {
        w.key = gap_key;
        throw_input(w, fmt::format("gap {:g} nm is beyond the model's range; expected a gap in (0, 100] nm",
                                   gap * 1e9));
    }
    if (!(std::isfinite(bias) && std::abs(bias) <= m.bias_limit_V)) {
        w.key = bias_key;
        throw_input(w, fmt::format("|bias| {:g} V exceeds the configured bias_limit; expected |bias| <= {:g} V "
                                   "(raise bias_limit in the configuration to go further)",
                                   std::abs(bias), m.bias_limit_V));
    }
}

std::vector<prediction> predict_points(const config& c, const std::vector<std::pair<double, double>>& points,
                                       int threads) {
    for (const auto& [s, V] : points) validate_operating_point(c.model, s, V, "gap", "bias");
    std::vector<prediction> out(points.size());
    // Planar and contact-anchored currents are J times a fixed area: reuse J, compute the area once.
    const bool fixed_area = c.geometry.kind != geometry_kind::paraboloid;
    const double area = c.geometry.kind == geometry_kind::planar ? c.geometry.area_m2
                        : fixed_area                              ? contact_anchored_area(c.model, c.geometry)
                                                                  : 0.0;
    detail::parallel_for(points.size(), threads, [&](std::size_t i) {
        auto [s, V] = points[i];
        prediction& p = out[i];
        p.q = evaluate_point(c.model, s, V);
        // The paraboloid rule reuses J and dJ/ds at the apex from evaluate_point.
        const double R = c.geometry.apex_radius_m;
        // The paraboloid rule also yields dI/dV on the same nodes (no extra currents).
        paraboloid_current_slopes tip;
        if (!fixed_area) tip = paraboloid_current_with_bias_slope(c.model, R, p.q);
        p.current_A = fixed_area ? area * p.q.current_density_A_per_m2 : tip.current_A;
        if (V != 0.0) {
            p.conductance_S = p.current_A / V;
        } else if (fixed_area) {
            p.conductance_S = area * p.q.differential_conductance_density_S_per_m2;
        } else {
            p.conductance_S = paraboloid_zero_bias_conductance(c.model, R, p.q);
        }
        p.conductance_G0 = p.conductance_S / si::conductance_quantum;
        const double kappa_per_nm = p.q.decay_constant_per_m * 1e-9;
        p.nm_per_decade = kappa_per_nm > 0 ? std::log(10.0) / (2.0 * kappa_per_nm) : 0.0;
        // The paraboloid sums J over local gaps, so d ln|I|/dV differs from the planar value.
        if (!fixed_area && V != 0.0 && p.current_A != 0.0) p.q.dlnI_dV_per_V = tip.d_dV_A_per_V / p.current_A;
        p.warnings = operating_warnings(s, V, p.conductance_G0, p.q.kind);
        // Far gaps: the current is below the smallest double, and the quantities derived from
        // ln|I| (apparent barrier) have no value; say so instead of a bare null.
        if (p.current_A == 0.0 && V != 0.0)
            p.warnings.push_back("the current is below 1e-308 A (it underflows double precision); the apparent "
                                 "barrier has no value at this gap");
    });
    return out;
}

}  // namespace tipgap
