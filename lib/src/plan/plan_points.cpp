// One planned setpoint with its instrument-facing quantities, and many setpoints in parallel.
#include <algorithm>
#include <cmath>
#include <fmt/format.h>
#include <limits>

#include "core/detail/parallel.hpp"
#include "plan/detail/gap_solver.hpp"
#include "tipgap/core/constants.hpp"
#include "tipgap/core/error.hpp"
#include "tipgap/model/geometry.hpp"
#include "tipgap/plan/plan.hpp"
#include "tipgap/plan/predict.hpp"
#include "tipgap/plan/warnings.hpp"

namespace tipgap {

plan_point plan_setpoint(const config& c, double current_A, double bias_V, const plan_options& o) {
    return detail::plan_setpoint_from(c, current_A, bias_V, o, std::numeric_limits<double>::quiet_NaN());
}

namespace detail {

plan_point plan_setpoint_from(const config& c, double current_A, double bias_V, const plan_options& o, double guess) {
    plan_point p;
    p.setpoint_A = current_A;
    p.bias_V = bias_V;
    p.solution = solve_gap_from(c, current_A, bias_V, o, guess);
    p.evaluations = p.solution.evaluations;
    if (!p.reachable()) {
        p.warnings.push_back(p.solution.message);
        return p;
    }
    const double s = p.solution.gap_m, I = p.solution.current_A;
    p.gap_resistance_ohm = bias_V / I;
    p.conductance_G0 = I / bias_V / si::conductance_quantum;
    // d ln|I|/ds of the total current (what a z-spectroscopy measures), from the solver's own
    // evaluation at the planned gap: analytic for the wkb model, exact for the paraboloid.
    double slope = p.solution.d_ln_current_ds_per_m;
    if (!std::isfinite(slope)) {
        slope = total_current_with_slope(c.model, c.geometry, s, bias_V).d_ln_current_ds_per_m;
        p.evaluations += 1;
    }
    if (std::isfinite(slope)) {
        p.decay_constant_per_m = -0.5 * slope;
        p.nm_per_decade = slope < 0 ? std::log(10.0) / -slope * 1e9 : std::numeric_limits<double>::infinity();
        // Apparent barrier height, phi_ap = (hbar^2 / 8m) (d ln I / ds)^2 (Binnig & Rohrer 1982,
        // Helv. Phys. Acta 55, 726; the usual 0.952 eV Å^2 form).
        p.apparent_barrier_J = si::hbar * si::hbar / (8.0 * si::electron_mass) * slope * slope;
    }
    p.kind = classify(c.model, s, bias_V);
    if (p.solution.status == solve_status::not_converged) p.warnings.push_back(p.solution.message);
    for (auto& w : operating_warnings(s, bias_V, p.conductance_G0, p.kind)) p.warnings.push_back(std::move(w));
    return p;
}

}  // namespace detail

namespace {

plan_point zero_bias_point(double current_A) {
    plan_point p;
    p.setpoint_A = current_A;
    p.bias_V = 0.0;
    p.solution.status = solve_status::zero_bias;
    p.solution.message = "no current flows at 0 V, so no gap holds a setpoint; the point is kept without a gap";
    p.note = p.solution.message;
    return p;
}

// dz_m of every point: its gap minus the gap at the reference bias for the same current (solved
// again only when the setpoints do not hold that bias).
void set_heights(const config& c, std::vector<plan_point>& out, const plan_options& o) {
    double ref = o.reference_bias_V;
    for (std::size_t i = 0; std::isnan(ref) && i < out.size(); ++i)
        if (out[i].bias_V != 0) ref = out[i].bias_V;
    if (std::isnan(ref)) return;
    std::vector<std::pair<double, double>> known;  // (|current|, gap at ref)
    for (plan_point& p : out) {
        const double I = std::abs(p.setpoint_A);
        double gap = std::numeric_limits<double>::quiet_NaN();
        bool found = false;
        for (const auto& [k, g] : known)
            if (k == I) gap = g, found = true;
        if (!found) {
            for (const plan_point& q : out)
                if (std::abs(q.setpoint_A) == I && q.bias_V == ref) gap = q.solution.gap_m, found = true;
            if (!found) gap = plan_setpoint(c, I, ref, o).solution.gap_m;
            known.emplace_back(I, gap);
        }
        p.dz_m = p.solution.gap_m - gap;
    }
}

}  // namespace

std::vector<plan_point> plan_setpoints(const config& c, const std::vector<std::pair<double, double>>& setpoints,
                                       const plan_options& o, int threads) {
    o.validate();
    std::vector<plan_point> out(setpoints.size());
    // Only zero biases: the request itself is wrong (solve_gap says why); else 0 V points are kept.
    const bool some_nonzero = std::any_of(setpoints.begin(), setpoints.end(), [](const auto& p) { return p.second != 0.0; });
    detail::parallel_for(setpoints.size(), threads, [&](std::size_t i) {
        const auto [I, V] = setpoints[i];
        out[i] = V == 0.0 && some_nonzero && std::isfinite(I) && I != 0 ? zero_bias_point(I) : plan_setpoint(c, I, V, o);
    });
    std::size_t reachable = 0;
    for (const auto& p : out) reachable += p.reachable();
    if (!out.empty() && reachable == 0) {
        const auto& first = out.front();
        std::string what = out.size() == 1
                               ? fmt::format("{:g} A at {:g} V: {}", first.setpoint_A, first.bias_V, first.solution.message)
                               : fmt::format("none of the {} setpoints can be reached (first: {:g} A at {:g} V: {})",
                                             out.size(), first.setpoint_A, first.bias_V, first.solution.message);
        throw error(error_kind::no_answer, what);
    }
    set_heights(c, out, o);
    return out;
}

}  // namespace tipgap
